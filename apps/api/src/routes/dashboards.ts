// The dashboards: Portfolio map, Brand comparison, Market desk, Channel sheet and Pooling
// review, each as JSON and as CSV exports. Numbers come from the current published run
// (the Pooling review from any finished run). Market scope: every route declares its
// rule here, and every response is built from `dashboardContext`, whose `visibleCells`
// narrows the run's cells to the viewer's markets in one place (exports included).
import { eq } from "drizzle-orm";
import type { BrandComparison, ChannelSheet, DashboardStatus, MarketDesk, PoolingReview, PortfolioMap } from "@tributary/contracts";
import { seesAllMarkets } from "../access/market-scope";
import { defineRoute, markets, signedIn, type SignedInContext } from "../access/route-table";
import { cells } from "../db/schema";
import { Conflict } from "../http/errors";
import {
  brandComparisonTable,
  channelSheetTable,
  channelSheetTables,
  marketDeskTable,
  marketDeskTables,
  poolingReviewTable,
  poolingReviewTables,
  portfolioMapTable,
  sendCsv,
  tableParam,
} from "../dashboards/csv-export";
import { dashboardContext, runForViewer, type DashboardContext } from "../dashboards/dashboard-context";
import { brandComparisonView, channelSheetView, marketDeskView, poolingReviewView, portfolioMapView, sheetTarget } from "../dashboards/dashboard-views";
import { demoFitStatus } from "../demo/demo-fit";
import { runRecord } from "../runs/run-queries";
import type { Queryable } from "../db/client";
import { readThroughGeneration } from "../db/data-generation";

const reviewRoles = ["analyst", "admin"] as const;

function context(ctx: SignedInContext, runId?: string): Promise<DashboardContext> {
  return dashboardContext(ctx.dashboards, { user: ctx.user, scope: ctx.scope }, runId);
}

function channelQuery(raw: unknown): string | null {
  if (raw === undefined || raw === "" || raw === "all") return null;
  return String(Array.isArray(raw) ? raw[0] : raw);
}

async function portfolioMap(ctx: SignedInContext): Promise<PortfolioMap> {
  return portfolioMapView(await context(ctx), channelQuery(ctx.req.query.channel));
}

async function brandComparison(ctx: SignedInContext): Promise<BrandComparison> {
  return brandComparisonView(await context(ctx));
}

async function marketDesk(ctx: SignedInContext): Promise<MarketDesk> {
  const current = await context(ctx);
  const previousId = current.published.previous;
  let previous: { run: DashboardContext["run"]; estimates: DashboardContext["estimates"] } | null = null;
  if (previousId && previousId !== current.run.id && current.run.id === current.published.current) {
    const [record, estimates] = await Promise.all([ctx.dashboards.runRecord(previousId, current.published.current), ctx.dashboards.estimates(previousId)]);
    previous = { run: runForViewer(record, ctx), estimates };
  }
  const marketName = new Map(current.entities.markets.map((m) => [m.id, m.name] as const));
  const plans = current.plans.map((p) => ({
    ...p,
    marketIds: [...p.marketIds],
    markets: p.marketIds.map((id) => marketName.get(id) ?? id),
    mine: p.createdBy?.id === ctx.user.id,
  }));
  return marketDeskView(current, previous, plans);
}

async function channelSheet(ctx: SignedInContext): Promise<ChannelSheet> {
  const current = await context(ctx);
  const target = sheetTarget(current, String(ctx.req.params.cellId), String(ctx.req.params.channel));
  const channel = target.cell.estimate.channels[target.c]!.channel;
  const data = await ctx.dashboards.sheet(current.run.id, target.cell.estimate.g, target.c);
  const history = current.flagHistory.filter((f) => f.cellId === target.cell.cellId && f.channel === channel);
  return channelSheetView(current, target, data, history);
}

async function poolingReview(ctx: SignedInContext): Promise<PoolingReview> {
  const requested = typeof ctx.req.query.run === "string" && ctx.req.query.run !== "" ? ctx.req.query.run : undefined;
  if (requested) {
    const run = await runRecord(ctx.db, requested);
    if (run.status !== "succeeded") throw new Conflict(`The run has no results: it is ${run.status}`);
  }
  return poolingReviewView(await context(ctx, requested));
}

/** The markets of a cell, for the Channel sheet's market rule (null: no such cell). */
async function cellMarkets(cellId: string, db: Queryable): Promise<string[] | null> {
  // Reused until the next write (db/data-generation.ts).
  const [row] = await readThroughGeneration(db, `cell's market\u0000${cellId}`, () => db.select({ marketId: cells.marketId }).from(cells).where(eq(cells.id, cellId)));
  return row ? [row.marketId] : null;
}

export const dashboardRoutes = [
  defineRoute({
    method: "get",
    path: "/api/dashboards/status",
    access: signedIn(markets.unscoped),
    handler: async ({ db, user, runs: service, dashboards }): Promise<DashboardStatus> => {
      const { current: currentId } = (await dashboards.snapshot()).published;
      const current = currentId ? await dashboards.runRecord(currentId, currentId) : null;
      return {
        current: current ? { runId: current.id, fittedAt: current.finishedAt, publishedAt: current.publication!.at, trustworthy: current.trust.trustworthy } : null,
        firstFit: await demoFitStatus({ db, runs: service }, current !== null, seesAllMarkets(user)),
      };
    },
  }),
  defineRoute({
    method: "get",
    path: "/api/dashboards/portfolio-map",
    access: signedIn(markets.fromQuery("market")),
    handler: portfolioMap,
  }),
  defineRoute({
    method: "get",
    path: "/api/dashboards/portfolio-map/export.csv",
    access: signedIn(markets.fromQuery("market")),
    handler: async (ctx) => {
      const view = await portfolioMap(ctx);
      sendCsv(ctx.res, `portfolio-map-${view.channel ?? "all-channels"}-${view.run.id.slice(0, 8)}.csv`, portfolioMapTable(view));
    },
  }),
  defineRoute({
    method: "get",
    path: "/api/dashboards/brand-comparison",
    access: signedIn(markets.fromQuery("market")),
    handler: brandComparison,
  }),
  defineRoute({
    method: "get",
    path: "/api/dashboards/brand-comparison/export.csv",
    access: signedIn(markets.fromQuery("market")),
    handler: async (ctx) => {
      const view = await brandComparison(ctx);
      sendCsv(ctx.res, `brand-comparison-${view.run.id.slice(0, 8)}.csv`, brandComparisonTable(view));
    },
  }),
  defineRoute({
    method: "get",
    path: "/api/dashboards/market-desk",
    access: signedIn(markets.fromQuery("market")),
    handler: marketDesk,
  }),
  defineRoute({
    method: "get",
    path: "/api/dashboards/market-desk/export.csv",
    access: signedIn(markets.fromQuery("market")),
    handler: async (ctx) => {
      const table = tableParam(ctx.req.query.table, marketDeskTables);
      const view = await marketDesk(ctx);
      sendCsv(ctx.res, `market-desk-${table}-${view.run.id.slice(0, 8)}.csv`, marketDeskTable(view, table));
    },
  }),
  defineRoute({
    method: "get",
    path: "/api/dashboards/channel-sheet/:cellId/:channel",
    access: signedIn(markets.resolvedBy((req, db) => cellMarkets(String(req.params.cellId), db))),
    handler: channelSheet,
  }),
  defineRoute({
    method: "get",
    path: "/api/dashboards/channel-sheet/:cellId/:channel/export.csv",
    access: signedIn(markets.resolvedBy((req, db) => cellMarkets(String(req.params.cellId), db))),
    handler: async (ctx) => {
      const table = tableParam(ctx.req.query.table, channelSheetTables);
      const view = await channelSheet(ctx);
      sendCsv(ctx.res, `channel-sheet-${view.cell.brand}-${view.cell.market}-${view.channel.code}-${table}.csv`, channelSheetTable(view, table));
    },
  }),
  defineRoute({
    method: "get",
    path: "/api/dashboards/pooling-review",
    access: signedIn(markets.filtered, reviewRoles),
    handler: poolingReview,
  }),
  defineRoute({
    method: "get",
    path: "/api/dashboards/pooling-review/export.csv",
    access: signedIn(markets.filtered, reviewRoles),
    handler: async (ctx) => {
      const table = tableParam(ctx.req.query.table, poolingReviewTables);
      const view = await poolingReview(ctx);
      sendCsv(ctx.res, `pooling-review-${table}-${view.run.id.slice(0, 8)}.csv`, poolingReviewTable(view, table));
    },
  }),
];
