import { z } from "zod";

// Saved plans: named spend scenarios (Spend planner) and budget splits (Budget split),
// as the API takes and sends them. A plan belongs to the run it was computed with and
// names its cells by workspace id; it is visible to a user only when every market of
// its cells is one of the user's markets.

export const planKinds = ["scenario", "budget_split"] as const;
export const planKindSchema = z.enum(planKinds);
export type PlanKind = z.infer<typeof planKindSchema>;
export const planKindLabels: Record<PlanKind, string> = { scenario: "Spend scenario", budget_split: "Budget split" };

/** Scenarios stay drafts; budget splits go draft → submitted → approved or rejected. */
export const planStatuses = ["draft", "submitted", "approved", "rejected"] as const;
export const planStatusSchema = z.enum(planStatuses);
export type PlanStatus = z.infer<typeof planStatusSchema>;
export const planStatusLabels: Record<PlanStatus, string> = {
  draft: "Draft",
  submitted: "Waiting for approval",
  approved: "Approved",
  rejected: "Rejected",
};

/** Plan horizon limits in weeks (the stats package refuses more than three years). */
export const planBounds = {
  horizon: { min: 1, max: 156, default: 13 },
  recentWeeks: { min: 1, max: 156, default: 13 },
  cells: { max: 500 },
  operations: { max: 200 },
  bounds: { max: 500 },
  name: { max: 120 },
  note: { max: 2000 },
  comment: { max: 2000 },
} as const;

const userRefSchema = z.object({ id: z.string(), name: z.string() });
/** "The total budget" inside a sentence: "Enter the total budget as a number". */
const inSentence = (what: string) => what.charAt(0).toLowerCase() + what.slice(1);
const finite = (what: string) => z.number(`Enter ${inSentence(what)} as a number`).refine(Number.isFinite, `${what} must be a finite number`);
const nonNegative = (what: string) => finite(what).refine((x) => x >= 0, `${what} cannot be negative`);
const weeksField = (what: string, bounds: { min: number; max: number }) =>
  z
    .number(`Enter ${inSentence(what)} as a whole number of weeks`)
    .int(`${what} must be a whole number of weeks`)
    .min(bounds.min, `${what} must be at least ${bounds.min} week`)
    .max(bounds.max, `${what} must be at most ${bounds.max} weeks`);

const planName = z
  .string("Give the plan a name")
  .trim()
  .min(1, "Give the plan a name")
  .max(planBounds.name.max, `Keep the name to ${planBounds.name.max} characters or fewer`);
const planNote = z.string().trim().max(planBounds.note.max, `Keep the note under ${planBounds.note.max} characters`);
const cellIdList = z
  .array(z.string().min(1), "Choose the cells (brand × market) of the plan")
  .min(1, "Choose at least one cell (brand × market)")
  .max(planBounds.cells.max)
  .refine((ids) => new Set(ids).size === ids.length, "A cell is chosen twice");

/** A cell named by brand and market, as operations and bounds name it (the names in the draw set). */
export const cellRefSchema = z.object({ brand: z.string().min(1), market: z.string().min(1) });
export type CellRefView = z.infer<typeof cellRefSchema>;

const nameList = (what: string) => z.array(z.string().min(1)).min(1, `The list of ${what} is empty; leave it out to mean all ${what}`);

/** Which lines (cell × channel) an operation or bound applies to; every list given narrows the choice. */
export const lineTargetSchema = z.object({
  channels: nameList("channels").optional(),
  markets: nameList("markets").optional(),
  brands: nameList("brands").optional(),
  cells: z.array(cellRefSchema).min(1, "The list of cells is empty; leave it out to mean all cells").optional(),
});
export type LineTargetView = z.infer<typeof lineTargetSchema>;

export const scenarioTargetSchema = lineTargetSchema.extend({
  /** Plan weeks changed, 0-based and inclusive (default: every plan week). */
  weeks: z
    .object({ from: z.number().int().min(0, "Plan weeks start at 0"), to: z.number().int().min(0, "Plan weeks start at 0") })
    .refine((w) => w.to >= w.from, "The last plan week comes before the first")
    .optional(),
});

/** A change to the current plan, applied in order (the stats package's scenario operations). */
export const scenarioOperationSchema = z.discriminatedUnion(
  "kind",
  [
    z.object({ kind: z.literal("scale"), target: scenarioTargetSchema.optional(), factor: nonNegative("The factor") }),
    z.object({ kind: z.literal("add"), target: scenarioTargetSchema.optional(), amountPerWeek: finite("The amount per week") }),
    z.object({ kind: z.literal("zero"), target: scenarioTargetSchema.optional() }),
    z.object({
      kind: z.literal("set"),
      target: scenarioTargetSchema.optional(),
      weekly: z.union([nonNegative("The weekly spend"), z.array(nonNegative("The weekly spend")).min(1)]),
    }),
  ],
  "Use an operation of kind scale, add, zero or set",
);
export type ScenarioOperationView = z.infer<typeof scenarioOperationSchema>;

/** Posterior summary over draws (mean, sd, 50 % and 90 % intervals). */
export const drawSummarySchema = z.object({
  mean: z.number(),
  sd: z.number(),
  q05: z.number(),
  q25: z.number(),
  q50: z.number(),
  q75: z.number(),
  q95: z.number(),
});
export type DrawSummaryView = z.infer<typeof drawSummarySchema>;

/** Ratio quantiles; values may be null where the ratio is unbounded (+∞). */
export const costPerExtraCustomerSchema = z.object({
  kind: z.enum(["cost", "saving-per-customer-lost", "more-customers-for-less", "fewer-customers-for-more", "undefined"]),
  text: z.string(),
  interval: z
    .object({
      q05: z.number().nullable(),
      q25: z.number().nullable(),
      q50: z.number().nullable(),
      q75: z.number().nullable(),
      q95: z.number().nullable(),
      unboundedShare: z.number(),
    })
    .nullable(),
});
export type CostPerExtraCustomerView = z.infer<typeof costPerExtraCustomerSchema>;

// ── scenarios ─────────────────────────────────────────────────────────────────

/**
 * POST /api/plans/scenarios and PUT /api/plans/:planId (a scenario): the base plan (each
 * cell × channel keeps its average weekly spend of the last `recentWeeks` data weeks,
 * for `horizon` weeks) and the operations that change it. The server recomputes the
 * headline numbers from these on the run's draws; the client sends none.
 */
export const scenarioPlanInput = z.object({
  name: planName,
  note: planNote.optional(),
  /** The run the scenario was worked out on; it must be the current run when saving. */
  runId: z.string().min(1, "Say which run the scenario was computed with"),
  cellIds: cellIdList,
  horizon: weeksField("The horizon", planBounds.horizon),
  recentWeeks: weeksField("The averaging window", planBounds.recentWeeks).default(planBounds.recentWeeks.default),
  operations: z.array(scenarioOperationSchema).max(planBounds.operations.max, `Use at most ${planBounds.operations.max} operations`),
  /** Seed of the forecast's predictive noise (default 1). */
  seed: z.number().int().min(0).max(4_294_967_295).default(1),
});
export type ScenarioPlanInput = z.input<typeof scenarioPlanInput>;

export const scenarioCellHeadlineSchema = z.object({
  cellId: z.string(),
  brand: z.string(),
  market: z.string(),
  currentSpend: z.number(),
  scenarioSpend: z.number(),
  currentOutcome: drawSummarySchema,
  scenarioOutcome: drawSummarySchema,
  extraCustomers: drawSummarySchema,
});

/** The scenario against the current plan, computed by the server when the plan was saved. */
export const scenarioHeadlineSchema = z.object({
  horizon: z.number().int(),
  currentSpend: z.number(),
  scenarioSpend: z.number(),
  extraSpend: z.number(),
  /** Outcome over the horizon with predictive noise. */
  currentOutcome: drawSummarySchema,
  scenarioOutcome: drawSummarySchema,
  /** Scenario minus current plan on the same draws (the noise cancels). */
  extraCustomers: drawSummarySchema,
  costPerExtraCustomer: costPerExtraCustomerSchema,
  cells: z.array(scenarioCellHeadlineSchema),
  drawCount: z.number().int(),
  computedAt: z.string(),
});
export type ScenarioHeadline = z.infer<typeof scenarioHeadlineSchema>;

export const scenarioDetailSchema = z.object({
  horizon: z.number().int(),
  recentWeeks: z.number().int(),
  seed: z.number().int(),
  operations: z.array(scenarioOperationSchema),
  headline: scenarioHeadlineSchema,
});
export type ScenarioDetail = z.infer<typeof scenarioDetailSchema>;

// ── budget splits ─────────────────────────────────────────────────────────────

/** Bounds on the spend of each line a target selects, over the whole horizon (same unit as the total). */
export const budgetBoundSchema = z
  .object({ target: lineTargetSchema.optional(), lower: nonNegative("The lower bound").optional(), upper: nonNegative("The upper bound").optional() })
  .refine((b) => b.lower === undefined || b.upper === undefined || b.lower <= b.upper, "The lower bound is above the upper bound");
export type BudgetBoundView = z.infer<typeof budgetBoundSchema>;

export const budgetObjectiveSchema = z.discriminatedUnion(
  "kind",
  [
    z.object({ kind: z.literal("customers") }),
    /** Profit = value × customers − spend, with the value of a new customer per brand (by brand name). */
    z.object({
      kind: z.literal("profit"),
      customerValue: z.record(z.string(), finite("The customer value").refine((x) => x > 0, "The customer value must be above 0")),
    }),
  ],
  "Choose the objective: customers or profit",
);
export type BudgetObjectiveView = z.infer<typeof budgetObjectiveSchema>;

export const riskAttitudeSchema = z.discriminatedUnion(
  "kind",
  [
    z.object({ kind: z.literal("expected") }),
    z.object({
      kind: z.literal("lower-quantile"),
      quantile: z.number().gt(0, "The quantile must be between 0 and 1").lt(1, "The quantile must be between 0 and 1"),
    }),
    z.object({ kind: z.literal("mean-minus-sd"), penalty: nonNegative("The penalty on the standard deviation") }),
  ],
  "Choose the risk attitude: expected, lower-quantile or mean-minus-sd",
);
export type RiskAttitudeView = z.infer<typeof riskAttitudeSchema>;

/** One line of an allocation: spend over the horizon of a cell × channel. */
export const allocationLineInput = z.object({
  cellId: z.string().min(1),
  channel: z.string().min(1),
  amount: nonNegative("The allocated amount"),
});

/**
 * POST /api/plans/budget-splits and PUT /api/plans/:planId (a budget split): the inputs
 * and the allocation the browser computed. The server recomputes the split with the
 * same inputs on the run's draws, refuses an allocation that differs from it (or breaks
 * the total or a bound), and stores its own result.
 */
export const budgetSplitPlanInput = z.object({
  name: planName,
  note: planNote.optional(),
  runId: z.string().min(1, "Say which run the split was computed with"),
  cellIds: cellIdList,
  totalBudget: finite("The total budget").refine((x) => x > 0, "The total budget must be above 0"),
  horizon: weeksField("The horizon", planBounds.horizon),
  recentWeeks: weeksField("The averaging window", planBounds.recentWeeks).default(planBounds.recentWeeks.default),
  bounds: z.array(budgetBoundSchema).max(planBounds.bounds.max).default([]),
  objective: budgetObjectiveSchema,
  risk: riskAttitudeSchema.default({ kind: "expected" }),
  /** The allocation the browser computed, one entry per cell × channel. */
  allocation: z.array(allocationLineInput).min(1, "Send the allocation the split computed"),
});
export type BudgetSplitPlanInput = z.input<typeof budgetSplitPlanInput>;

/** How far a sent allocation may differ from the server's, per line: this share of the total budget. */
export const ALLOCATION_TOLERANCE = 1e-6;

export const budgetSplitLineSchema = z.object({
  cellId: z.string(),
  brand: z.string(),
  market: z.string(),
  channel: z.string(),
  /** Spend over the horizon, and per week. */
  allocation: z.number(),
  weeklyAllocation: z.number(),
  /** Spend over the horizon at the current weekly spend. */
  current: z.number(),
  lower: z.number(),
  /** Null when unbounded. */
  upper: z.number().nullable(),
  activeBound: z.enum(["lower", "upper", "fixed"]).nullable(),
  /** Expected cost of one more customer at the allocation (null when the marginal return is 0). */
  marginalCac: z.number().nullable(),
  expectedCustomers: z.number(),
  beyondObservedSpend: z.boolean(),
});
export type BudgetSplitLineView = z.infer<typeof budgetSplitLineSchema>;

export const outcomeDistributionSchema = z.object({
  mean: z.number(),
  sd: z.number(),
  q05: z.number(),
  q50: z.number(),
  q95: z.number(),
  /** Counts per bin; bin i covers [edges[i], edges[i+1]); both distributions share the edges. */
  histogram: z.object({ edges: z.array(z.number()), counts: z.array(z.number().int()) }),
});

const outcomeComparisonSchema = z.object({ allocation: drawSummarySchema, current: drawSummarySchema, difference: drawSummarySchema });

/** The server's result of a split (what is stored and shown). */
export const budgetSplitResultSchema = z.object({
  objective: z.enum(["customers", "profit"]),
  horizon: z.number().int(),
  totalBudget: z.number(),
  allocatedTotal: z.number(),
  currentTotal: z.number(),
  budgetBinding: z.boolean(),
  exact: z.boolean(),
  method: z.string(),
  lines: z.array(budgetSplitLineSchema),
  /** The objective over posterior draws, for the allocation and the current spend. */
  outcome: z.object({ allocation: outcomeDistributionSchema, current: outcomeDistributionSchema }),
  customers: outcomeComparisonSchema,
  profit: outcomeComparisonSchema.nullable(),
  riskCriterion: z
    .object({ name: z.string(), allocation: z.number(), expectedValueSolution: z.number(), current: z.number(), iterations: z.number().int() })
    .nullable(),
  notes: z.array(z.string()),
  drawCount: z.number().int(),
  computedAt: z.string(),
});
export type BudgetSplitResultView = z.infer<typeof budgetSplitResultSchema>;

export const budgetSplitDetailSchema = z.object({
  totalBudget: z.number(),
  horizon: z.number().int(),
  recentWeeks: z.number().int(),
  bounds: z.array(budgetBoundSchema),
  objective: budgetObjectiveSchema,
  risk: riskAttitudeSchema,
  result: budgetSplitResultSchema,
});
export type BudgetSplitDetail = z.infer<typeof budgetSplitDetailSchema>;

// ── plans as sent ─────────────────────────────────────────────────────────────

export const planCellSchema = z.object({ cellId: z.string(), brandId: z.string(), marketId: z.string(), brand: z.string(), market: z.string() });

const planBase = {
  id: z.string(),
  name: z.string(),
  note: z.string().nullable(),
  status: planStatusSchema,
  runId: z.string(),
  /** False once a newer run is published: the numbers are those of the older run. */
  runIsCurrent: z.boolean(),
  markets: z.array(z.object({ id: z.string(), name: z.string() })),
  cells: z.array(planCellSchema),
  createdBy: userRefSchema.nullable(),
  createdAt: z.string(),
  updatedAt: z.string(),
  submitted: z.object({ by: userRefSchema.nullable(), at: z.string() }).nullable(),
  decision: z.object({ by: userRefSchema.nullable(), at: z.string(), comment: z.string().nullable() }).nullable(),
  /** What the viewer may do with the plan now. */
  can: z.object({ edit: z.boolean(), rename: z.boolean(), delete: z.boolean(), submit: z.boolean(), withdraw: z.boolean(), decide: z.boolean() }),
  /** Shown beside every allocation or forecast. */
  caution: z.string(),
};

export const scenarioPlanSchema = z.object({ kind: z.literal("scenario"), ...planBase, scenario: scenarioDetailSchema });
export const budgetSplitPlanSchema = z.object({ kind: z.literal("budget_split"), ...planBase, budgetSplit: budgetSplitDetailSchema });
/** GET /api/plans/:planId and the answer of every plan write. */
export const planSchema = z.discriminatedUnion("kind", [scenarioPlanSchema, budgetSplitPlanSchema]);
export type Plan = z.infer<typeof planSchema>;
export type ScenarioPlan = z.infer<typeof scenarioPlanSchema>;
export type BudgetSplitPlan = z.infer<typeof budgetSplitPlanSchema>;

/** GET /api/plans: a row of the plan list (without the full result). */
export const planSummarySchema = z.object({
  id: z.string(),
  kind: planKindSchema,
  name: z.string(),
  status: planStatusSchema,
  runId: z.string(),
  runIsCurrent: z.boolean(),
  markets: z.array(z.object({ id: z.string(), name: z.string() })),
  cellCount: z.number().int(),
  horizon: z.number().int(),
  /** Scenario: planned spend over the horizon; budget split: the total budget. */
  spend: z.number(),
  /** Scenario: extra customers against the current plan; budget split: customers against the current allocation. */
  extraCustomers: drawSummarySchema,
  createdBy: userRefSchema.nullable(),
  createdAt: z.string(),
  updatedAt: z.string(),
  decidedAt: z.string().nullable(),
});
export type PlanSummary = z.infer<typeof planSummarySchema>;

/** GET /api/plans query: all optional; `market` narrows to plans touching that market. */
export const planListQuery = z.object({
  kind: planKindSchema.optional(),
  status: planStatusSchema.optional(),
  market: z.string().optional(),
});

/** PATCH /api/plans/:planId: rename or change the note (any status). */
export const planRenameInput = z
  .object({ name: planName.optional(), note: planNote.nullable().optional() })
  .refine((v) => v.name !== undefined || v.note !== undefined, "Send a new name or note");
export type PlanRenameInput = z.infer<typeof planRenameInput>;

export const PLAN_DECISION_COMMENT_MIN_LENGTH = 5;
/** POST /api/plans/:planId/decision (portfolio leads and admins, on a submitted budget split). A rejection needs a comment. */
export const planDecisionInput = z
  .object({
    decision: z.enum(["approve", "reject"], "Choose approve or reject"),
    comment: z.string().trim().max(planBounds.comment.max, `Keep the comment under ${planBounds.comment.max} characters`).optional(),
  })
  .refine((v) => v.decision === "approve" || (v.comment !== undefined && v.comment.length >= PLAN_DECISION_COMMENT_MIN_LENGTH), {
    message: `Say why the plan is rejected (at least ${PLAN_DECISION_COMMENT_MIN_LENGTH} characters)`,
    path: ["comment"],
  });
export type PlanDecisionInput = z.infer<typeof planDecisionInput>;

/** Roles that may create budget splits; portfolio leads and admins decide on them. */
export const budgetSplitAuthorRoles = ["analyst", "portfolio_lead", "admin"] as const;
export const planDeciderRoles = ["portfolio_lead", "admin"] as const;
