import { z } from "zod";
import { brandSchema, channelSchema, marketSchema } from "./portfolio";
import { poolingFactorSchema, runSchema, runStatusSchema } from "./runs";

// The dashboards: Portfolio map, Brand comparison, Market desk, Channel sheet and
// Pooling review, all read from the current published run (the Pooling review from any
// finished run), and the analysts' flags on cell × channel estimates.
//
// Every dashboard response carries `run` (which run, when it was fitted, its trust mark
// and publish reason), `caution` (shown beside every profitability figure) and `flags`
// (the active flags on the cells in the response). A market manager gets only the cells
// of their markets, in every response and every CSV export.
//
// Routes (see apps/api/README.md):
//   GET  /api/dashboards/status                                 → DashboardStatus
//   GET  /api/dashboards/portfolio-map?channel=&market=         → PortfolioMap            (+ /export.csv)
//   GET  /api/dashboards/brand-comparison?market=               → BrandComparison         (+ /export.csv)
//   GET  /api/dashboards/market-desk?market=                    → MarketDesk              (+ /export.csv?table=estimates|changes|plans)
//   GET  /api/dashboards/channel-sheet/:cellId/:channel         → ChannelSheet            (+ /export.csv?table=response-curve|carry-over|contribution|profit-draws)
//   GET  /api/dashboards/pooling-review?run=                    → PoolingReview           (+ /export.csv?table=estimates|pooling-factors|outliers)
//   GET  /api/flags?status=active|cleared|all&market=&cell=&channel= → Flag[]             (+ /api/flags/export.csv)
//   POST /api/flags                 (CreateFlagInput)           → Flag (201)
//   POST /api/flags/:flagId/clear   (ClearFlagInput)            → Flag
// When no run has been published yet, the dashboard routes answer 404 (not_found) and
// /api/dashboards/status tells whether the first fit is running and how far it is.

// ---------------------------------------------------------------------------------
// Shared pieces
// ---------------------------------------------------------------------------------

/**
 * A posterior interval of a cost per new customer (or any positive quantity): median,
 * 90 % (q05–q95) and 50 % (q25–q75) central intervals, and the mean. q25/q75 are null
 * where only a 90 % summary is stored (the no-pooling comparison).
 */
export const cacIntervalSchema = z.object({
  mean: z.number(),
  q05: z.number(),
  q25: z.number().nullable(),
  q50: z.number(),
  q75: z.number().nullable(),
  q95: z.number(),
});
export type CacInterval = z.infer<typeof cacIntervalSchema>;

/** Which cost per new customer a figure is. */
export const cacBasisKinds = ["low_spend", "average_recent", "marginal"] as const;
export const cacBasisSchema = z.object({
  kind: z.enum(cacBasisKinds),
  /** Weeks of the average (average_recent): the last `weeks` fitted weeks; null otherwise. */
  weeks: z.number().int().nullable(),
  /** Plain words, e.g. "average CAC over the last 13 fitted weeks (spend ÷ contribution)". */
  label: z.string(),
});
export type CacBasis = z.infer<typeof cacBasisSchema>;

/** Weeks of the average CAC used for the chance of profit and the "current spend" (model.md default). */
export const RECENT_WEEKS = 13;

/**
 * The shrinkage mark: how far pooling moved a cell's estimate toward its group
 * (shrinkage 0 = not moved, 1 = all the way). "outside" is a ratio below 0 or above 1
 * (shown as such, never clipped). Thresholds are our own convention for the mark.
 */
export const shrinkageMarks = ["little", "moderate", "strong", "outside"] as const;
export type ShrinkageMark = (typeof shrinkageMarks)[number];
export const shrinkageMarkThresholds = { moderate: 0.25, strong: 0.5 } as const;
export const shrinkageMarkLabels: Record<ShrinkageMark, string> = {
  little: "Pooling moved it little",
  moderate: "Pooling moved it moderately",
  strong: "Pooling moved it strongly",
  outside: "Moved past the group or away from it (ratio outside 0–1)",
};
export function shrinkageMarkOf(shrinkage: number | null): ShrinkageMark | null {
  if (shrinkage === null || !Number.isFinite(shrinkage)) return null;
  if (shrinkage < 0 || shrinkage > 1) return "outside";
  if (shrinkage >= shrinkageMarkThresholds.strong) return "strong";
  if (shrinkage >= shrinkageMarkThresholds.moderate) return "moderate";
  return "little";
}

/** How pooling changed one cell × channel estimate (null fields without the no-pooling comparison). */
export const poolingMoveSchema = z.object({
  /** (m_unpooled − m_pooled)/(m_unpooled − m_group) of log β; not clipped. */
  shrinkage: z.number().nullable(),
  shrinkageMark: z.enum(shrinkageMarks).nullable(),
  /** Median pooled CAC0 ÷ median no-pooling CAC0 (0.8: pooling lowered the cost per customer by 20 %). */
  medianRatio: z.number().nullable(),
});
export type PoolingMove = z.infer<typeof poolingMoveSchema>;

// ---------------------------------------------------------------------------------
// Flags
// ---------------------------------------------------------------------------------

export const flagKinds = ["data_problem", "real_difference", "needs_lift_test"] as const;
export const flagKindSchema = z.enum(flagKinds, { message: `Choose the kind of flag: ${flagKinds.join(", ")}` });
export type FlagKind = z.infer<typeof flagKindSchema>;
export const flagKindLabels: Record<FlagKind, string> = {
  data_problem: "Data problem",
  real_difference: "Real difference",
  needs_lift_test: "Needs a lift test",
};

const userRefSchema = z.object({ id: z.string(), name: z.string() });

/**
 * An analyst's flag on one cell × channel. Flags belong to the cell and channel, not to
 * a run: they show on every run's screens until cleared; a cleared flag stays in the
 * history. At most one flag per cell × channel is active: a new one clears the old.
 */
export const flagSchema = z.object({
  id: z.string(),
  cellId: z.string(),
  brandId: z.string(),
  marketId: z.string(),
  brand: z.string(),
  market: z.string(),
  /** Channel code (as in the runs' results). */
  channel: z.string(),
  channelName: z.string(),
  kind: flagKindSchema,
  note: z.string(),
  /** The run under review when the flag was raised, if any. */
  runId: z.string().nullable(),
  createdAt: z.string(),
  createdBy: userRefSchema.nullable(),
  active: z.boolean(),
  clearedAt: z.string().nullable(),
  clearedBy: userRefSchema.nullable(),
});
export type Flag = z.infer<typeof flagSchema>;

export const FLAG_NOTE_MIN_LENGTH = 3;
export const FLAG_NOTE_MAX_LENGTH = 2000;

/** POST /api/flags (analysts and admins). */
export const createFlagInput = z.object({
  cellId: z.string("Choose the cell").trim().min(1, "Choose the cell"),
  channel: z.string("Choose the channel").trim().min(1, "Choose the channel"),
  kind: flagKindSchema,
  note: z
    .string("Write a note on why you flag this estimate")
    .trim()
    .min(FLAG_NOTE_MIN_LENGTH, `Write a note of at least ${FLAG_NOTE_MIN_LENGTH} characters on why you flag this estimate`)
    .max(FLAG_NOTE_MAX_LENGTH, `Keep the note under ${FLAG_NOTE_MAX_LENGTH} characters`),
  /** The run being reviewed; optional. */
  runId: z.string().trim().min(1).optional(),
});
export type CreateFlagInput = z.infer<typeof createFlagInput>;

/** POST /api/flags/:flagId/clear (analysts and admins); the note goes to the audit log. */
export const clearFlagInput = z.object({
  note: z.string().trim().max(FLAG_NOTE_MAX_LENGTH, `Keep the note under ${FLAG_NOTE_MAX_LENGTH} characters`).optional(),
});
export type ClearFlagInput = z.infer<typeof clearFlagInput>;

export const flagStatuses = ["active", "cleared", "all"] as const;

// ---------------------------------------------------------------------------------
// Status: is there a published run, is the first fit running?
// ---------------------------------------------------------------------------------

/** GET /api/dashboards/status (every signed-in role). */
export const dashboardStatusSchema = z.object({
  /** The current published run, or null before the first publication. */
  current: z
    .object({
      runId: z.string(),
      /** When the fit finished. */
      fittedAt: z.string().nullable(),
      publishedAt: z.string(),
      trustworthy: z.boolean().nullable(),
    })
    .nullable(),
  /**
   * The demo's first fit (queued at the first start of an empty database and published
   * automatically when it ends); null when there is none or it has been published.
   */
  firstFit: z
    .object({
      runId: z.string(),
      status: runStatusSchema,
      /** 0–1. */
      fraction: z.number(),
      etaSeconds: z.number().nullable(),
      /** e.g. "The first fit is running — 42 % done". */
      message: z.string(),
    })
    .nullable(),
});
export type DashboardStatus = z.infer<typeof dashboardStatusSchema>;

const dashboardBase = {
  /** The run the numbers come from: id, fitted and published when, trust mark, publish reason. */
  run: runSchema,
  currency: z.string(),
  /** Shown beside every profitability figure. */
  caution: z.string(),
  /** Active flags on the cells (and channels) of this response. */
  flags: z.array(flagSchema),
};

// ---------------------------------------------------------------------------------
// Portfolio map
// ---------------------------------------------------------------------------------

/** GET /api/dashboards/portfolio-map?channel=<code>|all (default all). */
export const portfolioMapCellSchema = z.object({
  cellId: z.string(),
  brandId: z.string(),
  marketId: z.string(),
  brand: z.string(),
  market: z.string(),
  /** Weeks of data of the cell in the run's dataset, and the weeks the model was fitted on. */
  weeks: z.number().int(),
  fittedWeeks: z.number().int(),
  firstWeek: z.string(),
  lastWeek: z.string(),
  /** False when the cell has no spend on the chosen channel (all: on any channel); its CAC fields are then null. */
  hasSpend: z.boolean(),
  /** The headline CAC (see `headline`): the low-spend CAC of a channel, or the combined average CAC of all channels. */
  cac: cacIntervalSchema.nullable(),
  /** Low-spend CAC0 = 1/β (one channel only; null for all channels). */
  cacLowSpend: cacIntervalSchema.nullable(),
  /** Average CAC over the last RECENT_WEEKS fitted weeks: Σ spend ÷ Σ contribution per draw (all channels: totals over channels). */
  cacAverage: cacIntervalSchema.nullable(),
  customerValue: z.number().nullable(),
  /** Share of draws whose average CAC (profitBasis) is below the brand's customer value; null without a value or spend. */
  probabilityProfitable: z.number().nullable(),
  /** How far pooling moved the estimate; for all channels, that of the channel it moved furthest (`moveChannel`). */
  pooling: poolingMoveSchema,
  moveChannel: z.string().nullable(),
  outlier: z.boolean(),
  /** Ids of the active flags on this cell (the chosen channel, or any channel for all). */
  flagIds: z.array(z.string()),
});
export type PortfolioMapCell = z.infer<typeof portfolioMapCellSchema>;

export const portfolioMapSchema = z.object({
  ...dashboardBase,
  /** Channel code shown, or null for all channels combined. */
  channel: z.string().nullable(),
  /** Channels of the run, in display order. */
  channels: z.array(channelSchema),
  brands: z.array(brandSchema),
  /** Markets the viewer sees. */
  markets: z.array(marketSchema),
  headline: cacBasisSchema,
  profitBasis: cacBasisSchema,
  /** One entry per brand × market cell of the run (in scope); a grid position without an entry has no data. */
  cells: z.array(portfolioMapCellSchema),
});
export type PortfolioMap = z.infer<typeof portfolioMapSchema>;

// ---------------------------------------------------------------------------------
// Brand comparison
// ---------------------------------------------------------------------------------

export const brandComparisonCellSchema = z.object({
  cellId: z.string(),
  marketId: z.string(),
  market: z.string(),
  hasSpend: z.boolean(),
  /** Low-spend CAC0 = 1/β, pooled. */
  cac: cacIntervalSchema,
  cacUnpooled: cacIntervalSchema.nullable(),
  pooling: poolingMoveSchema,
  outlier: z.boolean(),
  flagIds: z.array(z.string()),
});

export const brandComparisonRowSchema = z.object({
  channel: z.string(),
  brandId: z.string(),
  brand: z.string(),
  /**
   * The brand's own channel effect exp(−(μ_c + τB·zB)) as a CAC, across its markets;
   * null for market managers (it draws on markets they do not see) or without a brand level.
   */
  brandEffect: cacIntervalSchema.nullable(),
  /** The brand's cells in the viewer's markets, sorted by median CAC. */
  cells: z.array(brandComparisonCellSchema),
});

/** The portfolio-wide channel effect exp(−μ_c) as a CAC band: the reference of every row of that channel. */
export const channelReferenceSchema = z.object({
  channel: z.string(),
  name: z.string(),
  portfolioEffect: cacIntervalSchema,
});

/** GET /api/dashboards/brand-comparison?market= */
export const brandComparisonSchema = z.object({
  ...dashboardBase,
  basis: cacBasisSchema,
  channels: z.array(channelReferenceSchema),
  brands: z.array(brandSchema),
  markets: z.array(marketSchema),
  /** Channels × brands, channels in display order, brands by name; only rows with a cell in scope. */
  rows: z.array(brandComparisonRowSchema),
});
export type BrandComparison = z.infer<typeof brandComparisonSchema>;

// ---------------------------------------------------------------------------------
// Market desk
// ---------------------------------------------------------------------------------

export const deskEstimateSchema = z.object({
  channel: z.string(),
  channelName: z.string(),
  hasSpend: z.boolean(),
  /** Low-spend CAC0 = 1/β. */
  cac: cacIntervalSchema,
  /** Average CAC over the last RECENT_WEEKS fitted weeks; null without spend there. */
  cacAverage: cacIntervalSchema.nullable(),
  /** Mean weekly spend over the last RECENT_WEEKS fitted weeks. */
  currentWeeklySpend: z.number(),
  probabilityProfitable: z.number().nullable(),
  pooling: poolingMoveSchema,
  outlier: z.boolean(),
  flagIds: z.array(z.string()),
});

export const deskCellSchema = z.object({
  cellId: z.string(),
  brandId: z.string(),
  marketId: z.string(),
  brand: z.string(),
  market: z.string(),
  customerValue: z.number().nullable(),
  weeks: z.number().int(),
  lastWeek: z.string(),
  channels: z.array(deskEstimateSchema),
});

/** A median CAC0 with its 90 % interval, before or after. */
const changeSideSchema = z.object({ q05: z.number(), q50: z.number(), q95: z.number() });

/** What changed for one cell × channel since the previous published run (low-spend CAC0). */
export const deskChangeSchema = z.object({
  cellId: z.string(),
  brand: z.string(),
  market: z.string(),
  channel: z.string(),
  channelName: z.string(),
  /** compared: in both runs; new: only in the current run; dropped: only in the previous one. */
  status: z.enum(["compared", "new", "dropped"]),
  before: changeSideSchema.nullable(),
  after: changeSideSchema.nullable(),
  /** after.q50 ÷ before.q50 − 1 (0.1 = 10 % dearer). */
  medianChange: z.number().nullable(),
  /** Whether the two 90 % intervals overlap (no overlap: a change beyond the estimates' uncertainty). */
  intervalsOverlap: z.boolean().nullable(),
});

export const deskPlanSchema = z.object({
  id: z.string(),
  name: z.string(),
  kind: z.enum(["scenario", "budget_split"]),
  status: z.enum(["draft", "submitted", "approved", "rejected"]),
  runId: z.string(),
  marketIds: z.array(z.string()),
  markets: z.array(z.string()),
  createdAt: z.string(),
  updatedAt: z.string(),
  createdBy: userRefSchema.nullable(),
  /** Saved by the viewer. */
  mine: z.boolean(),
});

/** GET /api/dashboards/market-desk?market= (a market manager's home; other roles see every market). */
export const marketDeskSchema = z.object({
  ...dashboardBase,
  /** The run published before the current one, or null. */
  previousRun: runSchema.nullable(),
  markets: z.array(marketSchema),
  brands: z.array(brandSchema),
  channels: z.array(channelSchema),
  basis: cacBasisSchema,
  profitBasis: cacBasisSchema,
  cells: z.array(deskCellSchema),
  /** Per cell × channel, largest relative change first; empty without a previous run. */
  changes: z.array(deskChangeSchema),
  /** Saved spend plans touching only the viewer's markets (may be empty). */
  plans: z.array(deskPlanSchema),
});
export type MarketDesk = z.infer<typeof marketDeskSchema>;

// ---------------------------------------------------------------------------------
// Channel sheet
// ---------------------------------------------------------------------------------

/** Histogram of posterior draws on log-spaced bins between the 0.5 % and 99.5 % quantiles. */
export const drawHistogramSchema = z.object({
  scale: z.literal("log"),
  /** bins + 1 edges, increasing. */
  edges: z.array(z.number()),
  counts: z.array(z.number().int()),
  /** Draws below the first and above the last edge. */
  below: z.number().int(),
  above: z.number().int(),
  total: z.number().int(),
});

export const cacPosteriorSchema = z.object({
  basis: cacBasisSchema,
  summary: cacIntervalSchema,
  histogram: drawHistogramSchema,
});

/** Bands of a quantity: 90 % (q05–q95) and 50 % (q25–q75) intervals and the median. */
const bandsSchema = z.object({ q05: z.number(), q25: z.number(), q50: z.number(), q75: z.number(), q95: z.number() });

export const responseCurvePointSchema = z.object({
  weeklySpend: z.number(),
  /** Weekly new customers from the channel at this constant weekly spend (steady state). */
  response: bandsSchema,
  marginalCac: z.object({ q05: z.number(), q50: z.number(), q95: z.number() }),
});

const bandSeriesSchema = z.object({
  q05: z.array(z.number()),
  q25: z.array(z.number()),
  q50: z.array(z.number()),
  q75: z.array(z.number()),
  q95: z.array(z.number()),
});

/** GET /api/dashboards/channel-sheet/:cellId/:channel */
export const channelSheetSchema = z.object({
  ...dashboardBase,
  cell: z.object({
    cellId: z.string(),
    brandId: z.string(),
    marketId: z.string(),
    brand: z.string(),
    market: z.string(),
    customerValue: z.number().nullable(),
    weeks: z.number().int(),
    fittedWeeks: z.number().int(),
    firstWeek: z.string(),
    lastWeek: z.string(),
  }),
  channel: channelSchema,
  hasSpend: z.boolean(),
  recentWeeks: z.number().int(),
  /** Mean weekly spend over the last `recentWeeks` fitted weeks: the "current spend". */
  currentWeeklySpend: z.number(),
  lowSpendCac: cacPosteriorSchema,
  /** Marginal CAC at the current weekly spend (steady state). */
  marginalCac: cacPosteriorSchema,
  /** Average CAC over the last `recentWeeks` fitted weeks; null without spend there. */
  averageCac: cacPosteriorSchema.nullable(),
  responseCurve: z.object({
    points: z.array(responseCurvePointSchema),
    currentWeeklySpend: z.number(),
    /** Largest weekly spend in the cell's data on this channel. */
    maxObservedWeeklySpend: z.number(),
  }),
  /** Carry-over: the normalised adstock weight of spend l weeks ago, α^l / Σ α^k. */
  carryOver: z.object({
    maxLag: z.number().int(),
    alpha: bandsSchema,
    lags: z.array(bandsSchema.extend({ lag: z.number().int() })),
  }),
  /** Weekly contribution of the channel against the baseline without media, over all weeks of the cell. */
  contribution: z.object({
    weeks: z.array(z.string()),
    spend: z.array(z.number()),
    observed: z.array(z.number()),
    /** False for held-out weeks (not fitted). */
    fitted: z.array(z.boolean()),
    contribution: bandSeriesSchema,
    baseline: bandSeriesSchema,
  }),
  /**
   * Chance of profit against a customer-value slider: `draws` is a thinned vector of
   * per-draw CAC (profitBasis); the chance at value v is the share of draws below v.
   * null entries are draws with no finite CAC (never below any value). Empty without spend.
   */
  profit: z.object({
    basis: cacBasisSchema,
    customerValue: z.number().nullable(),
    probabilityAtCustomerValue: z.number().nullable(),
    draws: z.array(z.number().nullable()),
  }),
  /** The pooled estimate beside the no-pooling one and the group's (low-spend CAC0). */
  estimates: z.object({
    pooled: cacIntervalSchema,
    unpooled: cacIntervalSchema.nullable(),
    group: cacIntervalSchema.nullable(),
    pooling: poolingMoveSchema,
    outlier: z.boolean(),
    outlierReason: z.string().nullable(),
  }),
  /** Every flag ever raised on this cell × channel, newest first (active and cleared). */
  flagHistory: z.array(flagSchema),
});
export type ChannelSheet = z.infer<typeof channelSheetSchema>;

// ---------------------------------------------------------------------------------
// Pooling review (analysts and admins)
// ---------------------------------------------------------------------------------

export const poolingReviewRowSchema = z.object({
  cellId: z.string(),
  brandId: z.string(),
  marketId: z.string(),
  brand: z.string(),
  market: z.string(),
  channel: z.string(),
  channelName: z.string(),
  hasSpend: z.boolean(),
  /** Low-spend CAC0: pooled, no-pooling comparison, and the group (exp(−(μ + τB·zB + τM·zM))). */
  pooled: cacIntervalSchema,
  unpooled: cacIntervalSchema.nullable(),
  group: cacIntervalSchema.nullable(),
  pooling: poolingMoveSchema,
  outlier: z.boolean(),
  outlierReason: z.string().nullable(),
  flagIds: z.array(z.string()),
});

/** GET /api/dashboards/pooling-review?run=<runId> (default: the current run). */
export const poolingReviewSchema = z.object({
  ...dashboardBase,
  basis: cacBasisSchema,
  channels: z.array(channelReferenceSchema),
  /** Every cell × channel, largest shrinkage first (undefined shrinkage last). */
  rows: z.array(poolingReviewRowSchema),
  poolingFactors: z.array(poolingFactorSchema),
  outliers: z.array(
    z.object({ cellId: z.string(), brand: z.string(), market: z.string(), channel: z.string(), channelName: z.string(), reason: z.string() }),
  ),
});
export type PoolingReview = z.infer<typeof poolingReviewSchema>;
