// What every dashboard response is built from: the run (as the viewer may see it), its
// cached estimates, the workspace's names and customer values, and the active flags.
// `visibleCells` is the one place where a run's cells are narrowed to the viewer's
// markets: every dashboard view and export goes through it.
import { asc, desc, isNotNull } from "drizzle-orm";
import { modelCaution, type Brand, type Channel, type CurrentUser, type Flag, type Market, type Run } from "@tributary/contracts";
import { seesAllMarkets } from "../access/market-scope";
import type { MarketScope } from "../access/route-table";
import type { Queryable } from "../db/client";
import { brands, cells, channels, markets, runs, workspaceSettings } from "../db/schema";
import { NotFound } from "../http/errors";
import { runForScope } from "../runs/run-queries";
import type { DashboardCache } from "./dashboard-cache";
import { listFlags } from "./flags";
import type { CellEstimate, RunEstimates } from "./run-estimates";

export const noPublishedRun = "No fit has been published yet. The dashboards show the numbers of the current published run; see /api/dashboards/status for the first fit's progress.";

/** The current and the previous published run (latest publication first). */
export async function publishedRunIds(db: Queryable): Promise<{ current: string | null; previous: string | null }> {
  const rows = await db.select({ id: runs.id }).from(runs).where(isNotNull(runs.publishedAt)).orderBy(desc(runs.publishedAt)).limit(2);
  return { current: rows[0]?.id ?? null, previous: rows[1]?.id ?? null };
}

export interface Entities {
  readonly currency: string;
  /** Every brand, by name. */
  readonly brands: readonly Brand[];
  /** Every market, by name. */
  readonly markets: readonly Market[];
  /** Every channel, in display order. */
  readonly channels: readonly Channel[];
  readonly brandById: ReadonlyMap<string, Brand>;
  readonly marketById: ReadonlyMap<string, Market>;
  readonly channelByCode: ReadonlyMap<string, Channel>;
  readonly cellById: ReadonlyMap<string, { readonly brandId: string; readonly marketId: string }>;
}

export async function loadEntities(db: Queryable): Promise<Entities> {
  const [settings, brandRows, marketRows, channelRows, cellRows] = await Promise.all([
    db.select({ currency: workspaceSettings.currency }).from(workspaceSettings).limit(1),
    db.select({ id: brands.id, code: brands.code, name: brands.name, customerValue: brands.customerValue }).from(brands).orderBy(asc(brands.name)),
    db.select({ id: markets.id, code: markets.code, name: markets.name }).from(markets).orderBy(asc(markets.name)),
    db.select({ id: channels.id, code: channels.code, name: channels.name }).from(channels).orderBy(asc(channels.position)),
    db.select({ id: cells.id, brandId: cells.brandId, marketId: cells.marketId }).from(cells),
  ]);
  return {
    currency: settings[0]?.currency ?? "",
    brands: brandRows,
    markets: marketRows,
    channels: channelRows,
    brandById: new Map(brandRows.map((b) => [b.id, b] as const)),
    marketById: new Map(marketRows.map((m) => [m.id, m] as const)),
    channelByCode: new Map(channelRows.map((c) => [c.code, c] as const)),
    cellById: new Map(cellRows.map((c) => [c.id, { brandId: c.brandId, marketId: c.marketId }] as const)),
  };
}

/** A cell of the run that the viewer may see, with its workspace brand and market. */
export interface VisibleCell {
  readonly estimate: CellEstimate;
  readonly cellId: string;
  readonly brand: Brand;
  readonly market: Market;
}

/** The run's cells in the scope's markets (the only way views reach a run's cells). */
export function visibleCells(estimates: RunEstimates, entities: Entities, scope: MarketScope): VisibleCell[] {
  const allowed = new Set(scope.marketIds);
  const out: VisibleCell[] = [];
  for (const estimate of estimates.cells) {
    const ref = entities.cellById.get(estimate.cellId);
    if (!ref || !allowed.has(ref.marketId)) continue;
    const brand = entities.brandById.get(ref.brandId);
    const market = entities.marketById.get(ref.marketId);
    if (!brand || !market) continue;
    out.push({ estimate, cellId: estimate.cellId, brand, market });
  }
  return out.sort((a, b) => a.brand.name.localeCompare(b.brand.name) || a.market.name.localeCompare(b.market.name));
}

/** Markets of the scope, by name. */
export function visibleMarkets(entities: Entities, scope: MarketScope): Market[] {
  const allowed = new Set(scope.marketIds);
  return entities.markets.filter((m) => allowed.has(m.id));
}

export interface DashboardContext {
  readonly user: CurrentUser;
  readonly scope: MarketScope;
  /** The run as the viewer may see it (runForScope). */
  readonly run: Run;
  readonly estimates: RunEstimates;
  readonly entities: Entities;
  readonly cells: readonly VisibleCell[];
  /** Active flags on the visible cells. */
  readonly flags: readonly Flag[];
  readonly caution: string;
}

/** Flag ids by cell and channel code. */
export function flagIndex(flags: readonly Flag[]): (cellId: string, channel?: string) => string[] {
  const byKey = new Map<string, string[]>();
  for (const flag of flags) {
    for (const key of [`${flag.cellId}\u0000${flag.channel}`, `${flag.cellId}\u0000*`]) {
      const list = byKey.get(key) ?? [];
      list.push(flag.id);
      byKey.set(key, list);
    }
  }
  return (cellId, channel) => byKey.get(`${cellId}\u0000${channel ?? "*"}`) ?? [];
}

/** The dashboard context of a run (the current published one unless `runId` is given). */
export async function dashboardContext(
  db: Queryable,
  cache: DashboardCache,
  viewer: { user: CurrentUser; scope: MarketScope },
  runId?: string,
): Promise<DashboardContext> {
  const published = await publishedRunIds(db);
  const id = runId ?? published.current;
  if (!id) throw new NotFound(noPublishedRun);
  const [record, estimates, entities, flags] = await Promise.all([
    cache.runRecord(id, published.current),
    cache.estimates(id),
    loadEntities(db),
    listFlags(db, viewer.scope, { status: "active" }),
  ]);
  const cells = visibleCells(estimates, entities, viewer.scope);
  const shown = new Set(cells.map((c) => c.cellId));
  return {
    user: viewer.user,
    scope: viewer.scope,
    // Trust reasons name parameters of every cell: only for those who see every market.
    run: runForScope(record, { ...viewer.scope, allMarkets: seesAllMarkets(viewer.user) }),
    estimates,
    entities,
    cells,
    flags: flags.filter((f) => shown.has(f.cellId)),
    caution: modelCaution,
  };
}
