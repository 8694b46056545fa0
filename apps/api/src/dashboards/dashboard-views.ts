// The dashboard responses, built from a DashboardContext (whose cells are already
// narrowed to the viewer's markets). Exports are built from these same views.
import {
  shrinkageMarkOf,
  type BrandComparison,
  type CacInterval,
  type ChannelSheet,
  type Flag,
  type MarketDesk,
  type PoolingMove,
  type PoolingReview,
  type PortfolioMap,
  type Run,
} from "@tributary/contracts";
import { seesAllMarkets } from "../access/market-scope";
import { Invalid, NotFound } from "../http/errors";
import { averageBasis, combinedBasis, lowSpendBasis, type ChannelSheetData } from "./channel-sheet-data";
import { flagIndex, visibleCells, type DashboardContext, type VisibleCell } from "./dashboard-context";
import { shareBelow, type ChannelEstimate, type RunEstimates } from "./run-estimates";

function poolingMove(estimate: ChannelEstimate): PoolingMove {
  if (!estimate.hasSpend) return { shrinkage: null, shrinkageMark: null, medianRatio: null };
  return { shrinkage: estimate.shrinkage, shrinkageMark: shrinkageMarkOf(estimate.shrinkage), medianRatio: estimate.medianRatio };
}

const noMove: PoolingMove = { shrinkage: null, shrinkageMark: null, medianRatio: null };

/** The channel whose estimate pooling moved furthest (largest |log median ratio|) among those with spend. */
function furthestMove(channels: readonly ChannelEstimate[]): { move: PoolingMove; channel: string | null } {
  let best: ChannelEstimate | null = null;
  for (const ch of channels) {
    if (!ch.hasSpend || ch.medianRatio === null) continue;
    if (best === null || Math.abs(Math.log(ch.medianRatio)) > Math.abs(Math.log(best.medianRatio!))) best = ch;
  }
  return best ? { move: poolingMove(best), channel: best.channel } : { move: noMove, channel: null };
}

function channelIndexOf(estimates: RunEstimates, code: string): number {
  const c = estimates.channels.indexOf(code);
  if (c < 0) throw new Invalid(`Unknown channel "${code}"; this run has ${estimates.channels.join(", ")} (or "all")`, [{ path: "channel", message: `Choose one of ${estimates.channels.join(", ")} or all` }]);
  return c;
}

function channelName(ctx: DashboardContext, code: string): string {
  return ctx.entities.channelByCode.get(code)?.name ?? code;
}

/** The run's channel indices in the workspace's display order (set by admins); channels it no longer lists go last. */
function displayOrder(ctx: DashboardContext): number[] {
  const position = new Map(ctx.entities.channels.map((channel, k) => [channel.code, k] as const));
  const at = (c: number) => position.get(ctx.estimates.channels[c]!) ?? Number.MAX_SAFE_INTEGER;
  return ctx.estimates.channels.map((_, c) => c).sort((a, b) => at(a) - at(b) || a - b);
}

function runChannels(ctx: DashboardContext) {
  return displayOrder(ctx).map((c) => {
    const code = ctx.estimates.channels[c]!;
    return ctx.entities.channelByCode.get(code) ?? { id: code, code, name: code };
  });
}

/** Brands with at least one visible cell, by name. */
function visibleBrands(ctx: DashboardContext) {
  const ids = new Set(ctx.cells.map((c) => c.brand.id));
  return ctx.entities.brands.filter((b) => ids.has(b.id));
}

function visibleMarketList(ctx: DashboardContext) {
  const allowed = new Set(ctx.scope.marketIds);
  return ctx.entities.markets.filter((m) => allowed.has(m.id));
}

function probability(draws: ChannelEstimate["average"], value: number | null): number | null {
  return draws && value !== null && value > 0 ? shareBelow(draws, value) : null;
}

// ---------------------------------------------------------------------------------

/** Portfolio map for one channel (its code) or all channels combined (null). */
export function portfolioMapView(ctx: DashboardContext, channelParam: string | null): PortfolioMap {
  const c = channelParam === null ? null : channelIndexOf(ctx.estimates, channelParam);
  const flagsOf = flagIndex(ctx.flags);
  const cells = ctx.cells.map(({ estimate: e, cellId, brand, market }) => {
    const base = {
      cellId,
      brandId: brand.id,
      marketId: market.id,
      brand: brand.name,
      market: market.name,
      weeks: e.weeks,
      fittedWeeks: e.fittedWeeks,
      firstWeek: e.firstWeek,
      lastWeek: e.lastWeek,
      customerValue: brand.customerValue,
    };
    if (c === null) {
      const furthest = furthestMove(e.channels);
      return {
        ...base,
        hasSpend: e.hasAnySpend,
        cac: e.combined?.interval ?? null,
        cacLowSpend: null,
        cacAverage: e.combined?.interval ?? null,
        probabilityProfitable: probability(e.combined, brand.customerValue),
        pooling: furthest.move,
        moveChannel: furthest.channel,
        outlier: e.channels.some((ch) => ch.outlier),
        flagIds: flagsOf(cellId),
      };
    }
    const ch = e.channels[c]!;
    // A cell that never spent on the channel has no data for it: empty, not zero.
    return {
      ...base,
      hasSpend: ch.hasSpend,
      cac: ch.hasSpend ? ch.lowSpend.interval : null,
      cacLowSpend: ch.hasSpend ? ch.lowSpend.interval : null,
      cacAverage: ch.average?.interval ?? null,
      probabilityProfitable: probability(ch.average, brand.customerValue),
      pooling: poolingMove(ch),
      moveChannel: ch.hasSpend ? ch.channel : null,
      outlier: ch.outlier,
      flagIds: flagsOf(cellId, ch.channel),
    };
  });
  return {
    run: ctx.run,
    currency: ctx.entities.currency,
    caution: ctx.caution,
    flags: [...ctx.flags],
    channel: c === null ? null : ctx.estimates.channels[c]!,
    channels: runChannels(ctx),
    brands: visibleBrands(ctx),
    markets: visibleMarketList(ctx),
    headline: c === null ? combinedBasis : lowSpendBasis,
    profitBasis: c === null ? combinedBasis : averageBasis,
    cells,
  };
}

// ---------------------------------------------------------------------------------

function channelReferences(ctx: DashboardContext) {
  return displayOrder(ctx).map((c) => {
    const code = ctx.estimates.channels[c]!;
    return { channel: code, name: channelName(ctx, code), portfolioEffect: ctx.estimates.channelEffects[c]! };
  });
}

export function brandComparisonView(ctx: DashboardContext): BrandComparison {
  const flagsOf = flagIndex(ctx.flags);
  const showBrandEffect = seesAllMarkets(ctx.user);
  const rows: BrandComparison["rows"] = [];
  for (const c of displayOrder(ctx)) {
    const code = ctx.estimates.channels[c]!;
    for (const brand of visibleBrands(ctx)) {
      const brandCells = ctx.cells.filter((cell) => cell.brand.id === brand.id);
      if (brandCells.length === 0) continue;
      const fitBrand = brandCells[0]!.estimate.fitBrand;
      const cells = brandCells
        .map(({ estimate, cellId, market }) => {
          const ch = estimate.channels[c]!;
          return {
            cellId,
            marketId: market.id,
            market: market.name,
            hasSpend: ch.hasSpend,
            cac: ch.lowSpend.interval,
            cacUnpooled: ch.unpooled,
            pooling: poolingMove(ch),
            outlier: ch.outlier,
            flagIds: flagsOf(cellId, code),
          };
        })
        .sort((a, b) => a.cac.q50 - b.cac.q50);
      rows.push({
        channel: code,
        brandId: brand.id,
        brand: brand.name,
        brandEffect: showBrandEffect ? (ctx.estimates.brandEffects?.get(fitBrand)?.[c] ?? null) : null,
        cells,
      });
    }
  }
  return {
    run: ctx.run,
    currency: ctx.entities.currency,
    caution: ctx.caution,
    flags: [...ctx.flags],
    basis: lowSpendBasis,
    channels: channelReferences(ctx),
    brands: visibleBrands(ctx),
    markets: visibleMarketList(ctx),
    rows,
  };
}

// ---------------------------------------------------------------------------------

type DeskPlan = MarketDesk["plans"][number];

const side = (i: CacInterval) => ({ q05: i.q05, q50: i.q50, q95: i.q95 });

/** What changed per visible cell × channel (with spend in either run) from the previous published run. */
export function deskChanges(ctx: DashboardContext, previous: RunEstimates | null): MarketDesk["changes"] {
  if (!previous) return [];
  const before = new Map<string, ChannelEstimate>();
  for (const cell of visibleCells(previous, ctx.entities, ctx.scope)) {
    for (const ch of cell.estimate.channels) before.set(`${cell.cellId}\u0000${ch.channel}`, ch);
  }
  const previousCells = visibleCells(previous, ctx.entities, ctx.scope);
  const changes: MarketDesk["changes"] = [];
  const seen = new Set<string>();
  const describe = (cell: VisibleCell, channel: string) => ({ cellId: cell.cellId, brand: cell.brand.name, market: cell.market.name, channel, channelName: channelName(ctx, channel) });
  for (const cell of ctx.cells) {
    for (const ch of cell.estimate.channels) {
      const key = `${cell.cellId}\u0000${ch.channel}`;
      seen.add(key);
      const old = before.get(key);
      if (!ch.hasSpend && !old?.hasSpend) continue;
      if (!old) {
        changes.push({ ...describe(cell, ch.channel), status: "new", before: null, after: side(ch.lowSpend.interval), medianChange: null, intervalsOverlap: null });
        continue;
      }
      const a = ch.lowSpend.interval;
      const b = old.lowSpend.interval;
      changes.push({
        ...describe(cell, ch.channel),
        status: "compared",
        before: side(b),
        after: side(a),
        medianChange: a.q50 / b.q50 - 1,
        intervalsOverlap: a.q05 <= b.q95 && b.q05 <= a.q95,
      });
    }
  }
  for (const cell of previousCells) {
    for (const ch of cell.estimate.channels) {
      if (seen.has(`${cell.cellId}\u0000${ch.channel}`) || !ch.hasSpend) continue;
      changes.push({ ...describe(cell, ch.channel), status: "dropped", before: side(ch.lowSpend.interval), after: null, medianChange: null, intervalsOverlap: null });
    }
  }
  const size = (x: MarketDesk["changes"][number]) => (x.medianChange === null ? -1 : Math.abs(Math.log1p(x.medianChange)));
  return changes.sort((x, y) => size(y) - size(x));
}

export function marketDeskView(ctx: DashboardContext, previous: { run: Run; estimates: RunEstimates } | null, plans: DeskPlan[]): MarketDesk {
  const flagsOf = flagIndex(ctx.flags);
  const order = displayOrder(ctx);
  const cells = ctx.cells.map(({ estimate: e, cellId, brand, market }) => ({
    cellId,
    brandId: brand.id,
    marketId: market.id,
    brand: brand.name,
    market: market.name,
    customerValue: brand.customerValue,
    weeks: e.weeks,
    lastWeek: e.lastWeek,
    channels: order.map((c) => e.channels[c]!).map((ch) => ({
      channel: ch.channel,
      channelName: channelName(ctx, ch.channel),
      hasSpend: ch.hasSpend,
      cac: ch.lowSpend.interval,
      cacAverage: ch.average?.interval ?? null,
      currentWeeklySpend: ch.currentWeeklySpend,
      probabilityProfitable: probability(ch.average, brand.customerValue),
      pooling: poolingMove(ch),
      outlier: ch.outlier,
      flagIds: flagsOf(cellId, ch.channel),
    })),
  }));
  return {
    run: ctx.run,
    previousRun: previous?.run ?? null,
    currency: ctx.entities.currency,
    caution: ctx.caution,
    flags: [...ctx.flags],
    markets: visibleMarketList(ctx),
    brands: visibleBrands(ctx),
    channels: runChannels(ctx),
    basis: lowSpendBasis,
    profitBasis: averageBasis,
    cells,
    changes: deskChanges(ctx, previous?.estimates ?? null),
    plans,
  };
}

// ---------------------------------------------------------------------------------

/** The visible cell of the run with this id and the channel's index; 404 when either is not in the run. */
export function sheetTarget(ctx: DashboardContext, cellId: string, channel: string): { cell: VisibleCell; c: number } {
  const cell = ctx.cells.find((x) => x.cellId === cellId);
  if (!cell) throw new NotFound("This cell is not in the current run");
  const c = ctx.estimates.channels.indexOf(channel);
  if (c < 0) throw new NotFound(`The current run has no channel "${channel}"`);
  return { cell, c };
}

export function channelSheetView(ctx: DashboardContext, target: { cell: VisibleCell; c: number }, data: ChannelSheetData, history: readonly Flag[]): ChannelSheet {
  const { cell, c } = target;
  const e = cell.estimate;
  const ch = e.channels[c]!;
  const code = ch.channel;
  const value = cell.brand.customerValue;
  const channel = ctx.entities.channelByCode.get(code) ?? { id: code, code, name: code };
  const { profitDraws, ...computed } = data;
  return {
    run: ctx.run,
    currency: ctx.entities.currency,
    caution: ctx.caution,
    flags: ctx.flags.filter((f) => f.cellId === cell.cellId && f.channel === code),
    cell: {
      cellId: cell.cellId,
      brandId: cell.brand.id,
      marketId: cell.market.id,
      brand: cell.brand.name,
      market: cell.market.name,
      customerValue: value,
      weeks: e.weeks,
      fittedWeeks: e.fittedWeeks,
      firstWeek: e.firstWeek,
      lastWeek: e.lastWeek,
    },
    channel,
    ...computed,
    profit: {
      basis: averageBasis,
      customerValue: value,
      probabilityAtCustomerValue: probability(ch.average, value),
      draws: profitDraws,
    },
    estimates: {
      pooled: ch.lowSpend.interval,
      unpooled: ch.unpooled,
      group: ch.group,
      pooling: { shrinkage: ch.shrinkage, shrinkageMark: shrinkageMarkOf(ch.shrinkage), medianRatio: ch.medianRatio },
      outlier: ch.outlier,
      outlierReason: ch.outlierReason,
    },
    flagHistory: [...history],
  };
}

// ---------------------------------------------------------------------------------

export function poolingReviewView(ctx: DashboardContext): PoolingReview {
  const flagsOf = flagIndex(ctx.flags);
  const rows: PoolingReview["rows"] = [];
  for (const { estimate, cellId, brand, market } of ctx.cells) {
    for (const ch of estimate.channels) {
      rows.push({
        cellId,
        brandId: brand.id,
        marketId: market.id,
        brand: brand.name,
        market: market.name,
        channel: ch.channel,
        channelName: channelName(ctx, ch.channel),
        hasSpend: ch.hasSpend,
        pooled: ch.lowSpend.interval,
        unpooled: ch.unpooled,
        group: ch.group,
        pooling: { shrinkage: ch.shrinkage, shrinkageMark: shrinkageMarkOf(ch.shrinkage), medianRatio: ch.medianRatio },
        outlier: ch.outlier,
        outlierReason: ch.outlierReason,
        flagIds: flagsOf(cellId, ch.channel),
      });
    }
  }
  // Cells with spend first, then by shrinkage, largest first; undefined shrinkage last.
  const byShrinkage = (x: number | null, y: number | null) => (x === null ? (y === null ? 0 : 1) : y === null ? -1 : y - x);
  rows.sort(
    (a, b) =>
      Number(b.hasSpend) - Number(a.hasSpend) ||
      byShrinkage(a.pooling.shrinkage, b.pooling.shrinkage) ||
      a.brand.localeCompare(b.brand) ||
      a.market.localeCompare(b.market),
  );
  return {
    run: ctx.run,
    currency: ctx.entities.currency,
    caution: ctx.caution,
    flags: [...ctx.flags],
    basis: lowSpendBasis,
    channels: channelReferences(ctx),
    rows,
    poolingFactors: ctx.estimates.poolingFactors.map((p) => ({ level: p.level, channel: p.channel, poolingFactor: Number.isFinite(p.poolingFactor) ? p.poolingFactor : null })),
    outliers: rows
      .filter((r) => r.outlier)
      .map((r) => ({ cellId: r.cellId, brand: r.brand, market: r.market, channel: r.channel, channelName: r.channelName, reason: r.outlierReason ?? "Candidate outlier" })),
  };
}
