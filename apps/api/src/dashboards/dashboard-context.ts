// What every dashboard response is built from: the run (as the viewer may see it), its
// cached estimates, the workspace's names and customer values, and the flags — read in
// one query per request. `visibleCells` is the one place where a run's cells are
// narrowed to the viewer's markets: every dashboard view and export goes through it.
import { desc, isNotNull, sql } from "drizzle-orm";
import { modelCaution, type Brand, type Channel, type CurrentUser, type Flag, type Market, type Run } from "@tributary/contracts";
import { seesAllMarkets } from "../access/market-scope";
import type { MarketScope } from "../access/route-table";
import type { Queryable } from "../db/client";
import { runs } from "../db/schema";
import { NotFound } from "../http/errors";
import { runForScope } from "../runs/run-queries";
import type { DashboardCache } from "./dashboard-cache";
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

/** What a dashboard request reads from the database: published runs, names and values, every flag. */
export interface DashboardSnapshot {
  readonly published: { readonly current: string | null; readonly previous: string | null };
  readonly entities: Entities;
  /** Every flag of every market (active and cleared), newest first; narrow with `flagsInScope`. */
  readonly flags: readonly Flag[];
  /** Every saved plan (without its body), latest change first; narrow with `plansInScope`. */
  readonly plans: readonly SnapshotPlan[];
}

export interface SnapshotPlan {
  readonly id: string;
  readonly name: string;
  readonly kind: "scenario" | "budget_split";
  readonly status: "draft" | "submitted" | "approved" | "rejected";
  readonly runId: string;
  readonly marketIds: readonly string[];
  readonly createdAt: string;
  readonly updatedAt: string;
  readonly createdBy: { readonly id: string; readonly name: string } | null;
}

interface SnapshotRow {
  published: string[];
  currency: string | null;
  brands: Brand[];
  markets: Market[];
  channels: Channel[];
  cells: { id: string; brandId: string; marketId: string }[];
  flags: (Omit<Flag, "createdBy" | "clearedBy" | "active"> & {
    createdById: string | null;
    createdByName: string | null;
    clearedById: string | null;
    clearedByName: string | null;
  })[];
  plans: (Omit<SnapshotPlan, "createdBy"> & { createdById: string | null; createdByName: string | null })[];
}

const byName = (a: { name: string }, b: { name: string }) => a.name.localeCompare(b.name);

export async function loadDashboardSnapshot(db: Queryable): Promise<DashboardSnapshot> {
  // One round trip: the database runs in this process, so every query holds the event loop.
  const result = await db.execute(sql`
    select json_build_object(
      'published', (select coalesce(json_agg(p.id order by p.published_at desc), '[]'::json)
                    from (select id, published_at from runs where published_at is not null order by published_at desc limit 2) p),
      'currency', (select currency from workspace_settings limit 1),
      'brands', (select coalesce(json_agg(json_build_object('id', id, 'code', code, 'name', name, 'customerValue', customer_value)), '[]'::json) from brands),
      'markets', (select coalesce(json_agg(json_build_object('id', id, 'code', code, 'name', name)), '[]'::json) from markets),
      'channels', (select coalesce(json_agg(json_build_object('id', id, 'code', code, 'name', name) order by position), '[]'::json) from channels),
      'cells', (select coalesce(json_agg(json_build_object('id', id, 'brandId', brand_id, 'marketId', market_id)), '[]'::json) from cells),
      'flags', (select coalesce(json_agg(json_build_object(
                  'id', f.id, 'cellId', f.cell_id, 'brandId', c.brand_id, 'marketId', c.market_id, 'brand', b.name, 'market', m.name,
                  'channel', ch.code, 'channelName', ch.name, 'kind', f.kind, 'note', f.note, 'runId', f.run_id,
                  'createdAt', f.created_at, 'createdById', f.created_by, 'createdByName', u.name,
                  'clearedAt', f.cleared_at, 'clearedById', f.cleared_by, 'clearedByName', cu.name
                ) order by f.created_at desc, f.id desc), '[]'::json)
                from flags f
                join cells c on c.id = f.cell_id
                join brands b on b.id = c.brand_id
                join markets m on m.id = c.market_id
                join channels ch on ch.id = f.channel_id
                left join users u on u.id = f.created_by
                left join users cu on cu.id = f.cleared_by),
      'plans', (select coalesce(json_agg(json_build_object(
                  'id', p.id, 'name', p.name, 'kind', p.kind, 'status', p.status, 'runId', p.run_id, 'marketIds', p.market_ids,
                  'createdAt', p.created_at, 'updatedAt', p.updated_at, 'createdById', p.created_by, 'createdByName', u.name
                ) order by p.updated_at desc, p.id), '[]'::json)
                from plans p left join users u on u.id = p.created_by)
    ) as snapshot`);
  const raw = (result as unknown as { rows: { snapshot: SnapshotRow | string }[] }).rows[0]!.snapshot;
  const data: SnapshotRow = typeof raw === "string" ? (JSON.parse(raw) as SnapshotRow) : raw;
  const brandList = [...data.brands].sort(byName);
  const marketList = [...data.markets].sort(byName);
  const iso = (value: string | null) => (value === null ? null : new Date(value).toISOString());
  const flags: Flag[] = data.flags.map(({ createdById, createdByName, clearedById, clearedByName, ...flag }) => ({
    ...flag,
    createdAt: iso(flag.createdAt)!,
    clearedAt: iso(flag.clearedAt),
    createdBy: createdById && createdByName ? { id: createdById, name: createdByName } : null,
    active: flag.clearedAt === null,
    clearedBy: clearedById && clearedByName ? { id: clearedById, name: clearedByName } : null,
  }));
  return {
    published: { current: data.published[0] ?? null, previous: data.published[1] ?? null },
    entities: {
      currency: data.currency ?? "",
      brands: brandList,
      markets: marketList,
      channels: data.channels,
      brandById: new Map(brandList.map((b) => [b.id, b] as const)),
      marketById: new Map(marketList.map((m) => [m.id, m] as const)),
      channelByCode: new Map(data.channels.map((c) => [c.code, c] as const)),
      cellById: new Map(data.cells.map((c) => [c.id, { brandId: c.brandId, marketId: c.marketId }] as const)),
    },
    flags,
    plans: data.plans.map(({ createdById, createdByName, ...plan }) => ({
      ...plan,
      createdAt: iso(plan.createdAt)!,
      updatedAt: iso(plan.updatedAt)!,
      createdBy: createdById && createdByName ? { id: createdById, name: createdByName } : null,
    })),
  };
}

/** Plans whose markets all lie in the scope (a market manager sees a plan only if every market is theirs). */
export function plansInScope(plans: readonly SnapshotPlan[], scope: MarketScope): SnapshotPlan[] {
  const allowed = new Set(scope.marketIds);
  return plans.filter((p) => p.marketIds.length > 0 && p.marketIds.every((id) => allowed.has(id)));
}

/** Flags on cells in the scope's markets. */
export function flagsInScope(flags: readonly Flag[], scope: MarketScope): Flag[] {
  const allowed = new Set(scope.marketIds);
  return flags.filter((f) => allowed.has(f.marketId));
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
  return out.sort((a, b) => byName(a.brand, b.brand) || byName(a.market, b.market));
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
  /** Every flag (active and cleared) in the viewer's markets, newest first. */
  readonly flagHistory: readonly Flag[];
  /** The current and previous published runs. */
  readonly published: DashboardSnapshot["published"];
  /** Saved plans touching only the viewer's markets. */
  readonly plans: readonly SnapshotPlan[];
  readonly caution: string;
}

/** Flag ids by cell and channel code (all channels of the cell when none is given). */
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

/** Trust reasons name parameters of every cell: they are shown only to those who see every market. */
export function runForViewer(run: Run, viewer: { user: CurrentUser; scope: MarketScope }): Run {
  return runForScope(run, { ...viewer.scope, allMarkets: seesAllMarkets(viewer.user) });
}

/** The dashboard context of a run (the current published one unless `runId` is given). */
export async function dashboardContext(
  cache: DashboardCache,
  viewer: { user: CurrentUser; scope: MarketScope },
  runId?: string,
): Promise<DashboardContext> {
  const snapshot = await cache.snapshot();
  const id = runId ?? snapshot.published.current;
  if (!id) throw new NotFound(noPublishedRun);
  const [record, estimates] = await Promise.all([cache.runRecord(id, snapshot.published.current), cache.estimates(id)]);
  const cells = visibleCells(estimates, snapshot.entities, viewer.scope);
  const shown = new Set(cells.map((c) => c.cellId));
  const history = flagsInScope(snapshot.flags, viewer.scope);
  return {
    user: viewer.user,
    scope: viewer.scope,
    run: runForViewer(record, viewer),
    estimates,
    entities: snapshot.entities,
    cells,
    flags: history.filter((f) => f.active && shown.has(f.cellId)),
    flagHistory: history,
    published: snapshot.published,
    plans: plansInScope(snapshot.plans, viewer.scope),
    caution: modelCaution,
  };
}
