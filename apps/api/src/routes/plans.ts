// Planning: the current run's draws for the planner's worker (scoped to the viewer's
// markets), saved scenarios and budget splits, approval of budget splits, CSV exports.
// A plan is visible iff all its markets are the viewer's (`markets.resolvedBy`: out of
// scope looks like not found); saving checks the plan's cells against the viewer's markets.
import type { Response } from "express";
import {
  budgetSplitAuthorRoles,
  budgetSplitPlanInput,
  planDecisionInput,
  planDeciderRoles,
  planListQuery,
  planRenameInput,
  scenarioPlanInput,
  type DrawSetWire,
  type Plan,
  type PlanSummary,
} from "@tributary/contracts";
import { allowedMarkets } from "../access/market-scope";
import { defineRoute, markets, signedIn } from "../access/route-table";
import { Invalid } from "../http/errors";
import { allocationCsv, forecastCsv } from "../plans/plan-csv";
import { listPlanSummaries, planMarkets, planView, bodyOf } from "../plans/plan-records";
import { channelNames } from "../queries/channel-names";
import {
  createBudgetSplitPlan,
  createScenarioPlan,
  decidePlan,
  deletePlan,
  planRow,
  renamePlan,
  submitPlan,
  updatePlan,
  withdrawPlan,
} from "../plans/plan-service";
import { cellIdsOfQuery, cellIndicesInScope, currentPlanningDraws, drawSetOfCells, drawSetWire, planningDraws } from "../plans/planning-draws";

const planMarketRule = markets.resolvedBy((req, db) => planMarkets(db, String(req.params.planId)));

function sendCsv(res: Response, name: string, csv: string): void {
  const safe = name.replace(/[^A-Za-z0-9._-]+/g, "-").replace(/^-+|-+$/g, "").slice(0, 80) || "plan";
  res.status(200);
  res.setHeader("Content-Type", "text/csv; charset=utf-8");
  res.setHeader("Content-Disposition", `attachment; filename="${safe}.csv"`);
  // A byte-order mark so spreadsheet programs read the file as UTF-8.
  res.send(`\uFEFF${csv}`);
}

export const planRoutes = [
  defineRoute({
    method: "get",
    path: "/api/runs/current/draw-set",
    access: signedIn(markets.filtered),
    handler: async ({ req, res, db, scope }): Promise<DrawSetWire> => {
      const draws = await currentPlanningDraws(db);
      const indices = cellIndicesInScope(draws, scope, cellIdsOfQuery(req.query.cells));
      res.setHeader("Cache-Control", "private, no-cache");
      return drawSetWire(db, draws, indices);
    },
  }),
  defineRoute({
    method: "get",
    path: "/api/plans",
    access: signedIn(markets.filtered),
    handler: ({ req, db, scope }): Promise<PlanSummary[]> => listPlanSummaries(db, scope, planListQuery.parse(req.query)),
  }),
  defineRoute({
    method: "post",
    path: "/api/plans/scenarios",
    access: signedIn(markets.filtered),
    handler: async ({ req, res, db, user, scope }): Promise<Plan> => {
      const row = await createScenarioPlan(db, user, scope, scenarioPlanInput.parse(req.body ?? {}));
      res.status(201);
      return planView(db, row, user);
    },
  }),
  defineRoute({
    method: "post",
    path: "/api/plans/budget-splits",
    access: signedIn(markets.filtered, budgetSplitAuthorRoles),
    handler: async ({ req, res, db, user, scope }): Promise<Plan> => {
      const row = await createBudgetSplitPlan(db, user, scope, budgetSplitPlanInput.parse(req.body ?? {}));
      res.status(201);
      return planView(db, row, user);
    },
  }),
  defineRoute({
    method: "get",
    path: "/api/plans/:planId",
    access: signedIn(planMarketRule),
    handler: async ({ req, db, user }): Promise<Plan> => planView(db, await planRow(db, String(req.params.planId)), user),
  }),
  defineRoute({
    method: "put",
    path: "/api/plans/:planId",
    access: signedIn(planMarketRule),
    handler: async ({ req, db, user }): Promise<Plan> => {
      const row = await planRow(db, String(req.params.planId));
      // The new cells may be in any of the user's markets, not only the plan's present ones.
      const scope = await allowedMarkets(db, user);
      const updated = await updatePlan(db, user, scope, row, req.body ?? {}, {
        scenario: (raw) => scenarioPlanInput.parse(raw),
        split: (raw) => budgetSplitPlanInput.parse(raw),
      });
      return planView(db, updated, user);
    },
  }),
  defineRoute({
    method: "patch",
    path: "/api/plans/:planId",
    access: signedIn(planMarketRule),
    handler: async ({ req, db, user }): Promise<Plan> => {
      const change = planRenameInput.parse(req.body ?? {});
      const updated = await renamePlan(db, user, await planRow(db, String(req.params.planId)), change);
      return planView(db, updated, user);
    },
  }),
  defineRoute({
    method: "delete",
    path: "/api/plans/:planId",
    access: signedIn(planMarketRule),
    handler: async ({ req, db, user }) => {
      await deletePlan(db, user, await planRow(db, String(req.params.planId)));
      return undefined;
    },
  }),
  defineRoute({
    method: "post",
    path: "/api/plans/:planId/submit",
    access: signedIn(planMarketRule, budgetSplitAuthorRoles),
    handler: async ({ req, db, user, mailer, config }): Promise<Plan> => {
      const updated = await submitPlan(db, user, await planRow(db, String(req.params.planId)), { mailer, config, req });
      return planView(db, updated, user);
    },
  }),
  defineRoute({
    method: "post",
    path: "/api/plans/:planId/withdraw",
    access: signedIn(planMarketRule, budgetSplitAuthorRoles),
    handler: async ({ req, db, user }): Promise<Plan> => planView(db, await withdrawPlan(db, user, await planRow(db, String(req.params.planId))), user),
  }),
  defineRoute({
    method: "post",
    path: "/api/plans/:planId/decision",
    access: signedIn(planMarketRule, planDeciderRoles),
    handler: async ({ req, db, user, mailer, config }): Promise<Plan> => {
      const input = planDecisionInput.parse(req.body ?? {});
      const updated = await decidePlan(db, user, await planRow(db, String(req.params.planId)), input, { mailer, config, req });
      return planView(db, updated, user);
    },
  }),
  ...(["allocation", "forecast"] as const).map((table) =>
    defineRoute({
      method: "get",
      path: `/api/plans/:planId/${table}.csv`,
      access: signedIn(planMarketRule),
      handler: async ({ req, res, db }) => {
        const row = await planRow(db, String(req.params.planId));
        const body = bodyOf(row);
        const draws = await planningDraws(db, row.runId);
        const position = new Map(draws.cells.map((cell, g) => [cell.cellId, g] as const));
        const indices = body.cellIds.map((id) => position.get(id));
        if (indices.some((g) => g === undefined)) throw new Invalid("The plan names a cell its fit does not have");
        const set = drawSetOfCells(draws.set, indices as number[]);
        sendCsv(res, `${row.name}-${table}`, table === "allocation" ? allocationCsv(row.kind, body, set, await channelNames(db)) : forecastCsv(row.kind, body, set));
      },
    }),
  ),
];
