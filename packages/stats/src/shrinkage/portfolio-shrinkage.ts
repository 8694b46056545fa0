import type { PortfolioData } from "../data/portfolio-data";
import { buildPortfolioConstants } from "../model/portfolio/portfolio-constants";
import { resolvePortfolioOptions, type PortfolioModelOptions } from "../model/portfolio/portfolio-options";
import type { NamedDraws } from "../decisions/draw-set";
import { poolingFactor } from "./pooling-factor";

export interface CellShrinkage {
  readonly cell: number;
  readonly brand: string;
  readonly market: string;
  readonly channel: string;
  /** Posterior means of log β: unpooled fit, pooled fit, and the pooled group mean μ + τB·zB + τM·zM. */
  readonly logBetaUnpooled: number;
  readonly logBetaPooled: number;
  readonly logBetaGroup: number;
  /** (m_unpooled − m_pooled) / (m_unpooled − m_group): 0 = not moved, 1 = pulled to the group; not clipped. */
  readonly shrinkage: number;
  /** 90 % interval of log β in the unpooled fit. */
  readonly unpooledQ05: number;
  readonly unpooledQ95: number;
}

export interface LevelPooling {
  readonly level: "brand" | "market" | "cell";
  readonly channel: string;
  /** Gelman & Pardoe (2006) pooling factor. */
  readonly poolingFactor: number;
}

export interface CandidateOutlier {
  readonly cell: number;
  readonly brand: string;
  readonly market: string;
  readonly channel: string;
  readonly reason: string;
}

export interface ShrinkageReport {
  readonly cells: readonly CellShrinkage[];
  readonly levels: readonly LevelPooling[];
  readonly candidateOutliers: readonly CandidateOutlier[];
}

export interface ShrinkageInputs {
  readonly channels: readonly string[];
  readonly cells: readonly { readonly brand: string; readonly market: string; readonly trainWeeks: number; readonly weeksWithSpend: readonly number[] }[];
  readonly brandCount: number;
  readonly marketCount: number;
  readonly pooled: NamedDraws;
  readonly unpooled: NamedDraws;
}

export interface OutlierRule {
  /** Shrinkage at or above this is "large" (default 0.5; our own heuristic, not from a source). */
  readonly largeShrinkage: number;
  /** Weeks with spend at or above this count as "long" data (default 52; our own heuristic). */
  readonly longDataWeeks: number;
}

const defaultRule: OutlierRule = { largeShrinkage: 0.5, longDataWeeks: 52 };

function columnReader(posterior: NamedDraws, label: string): { drawCount: number; column(name: string): Float64Array } {
  const width = posterior.names.length;
  if (width === 0 || posterior.draws.length % width !== 0) throw new RangeError(`${label}: the draws do not match the names`);
  const drawCount = posterior.draws.length / width;
  const index = new Map(posterior.names.map((n, i) => [n, i]));
  return {
    drawCount,
    column(name: string): Float64Array {
      const j = index.get(name);
      if (j === undefined) throw new RangeError(`${label}: no parameter named "${name}"`);
      const out = new Float64Array(drawCount);
      for (let d = 0; d < drawCount; d++) out[d] = posterior.draws[d * width + j]!;
      return out;
    },
  };
}

function mean(values: Float64Array): number {
  let s = 0;
  for (const v of values) s += v;
  return s / values.length;
}

function sdOf(values: Float64Array, m: number): number {
  let ss = 0;
  for (const v of values) ss += (v - m) * (v - m);
  return Math.sqrt(ss / Math.max(1, values.length - 1));
}

function sortedQuantile(values: Float64Array, p: number): number {
  const s = Float64Array.from(values).sort();
  const h = (s.length - 1) * p;
  const lo = Math.floor(h);
  return s[lo]! + (h - lo) * (s[Math.min(lo + 1, s.length - 1)]! - s[lo]!);
}

/**
 * Shrinkage per cell × channel, pooling factors per level and channel, and candidate
 * outliers: a cell whose unpooled 90 % interval of log β excludes the pooled group
 * estimate, or whose shrinkage is large although its data are long (and its own estimate
 * is at least one posterior sd away from the group, so the ratio is not noise). The
 * analyst decides.
 */
export function portfolioShrinkage(inputs: ShrinkageInputs, rule: OutlierRule = defaultRule): ShrinkageReport {
  const pooled = columnReader(inputs.pooled, "pooled draws");
  const unpooled = columnReader(inputs.unpooled, "unpooled draws");
  const cells: CellShrinkage[] = [];
  const outliers: CandidateOutlier[] = [];
  inputs.cells.forEach((cell, g) => {
    inputs.channels.forEach((channel, c) => {
      const eta = unpooled.column(`eta[${g},${channel}]`);
      const logBeta = pooled.column(`beta[${g},${channel}]`).map(Math.log);
      const group = pooled.column(`logBetaGroup[${g},${channel}]`);
      const mU = mean(eta);
      const mP = mean(logBeta);
      const mG = mean(group);
      const shrink = mU === mG ? NaN : (mU - mP) / (mU - mG);
      const q05 = sortedQuantile(eta, 0.05);
      const q95 = sortedQuantile(eta, 0.95);
      cells.push({ cell: g, brand: cell.brand, market: cell.market, channel, logBetaUnpooled: mU, logBetaPooled: mP, logBetaGroup: mG, shrinkage: shrink, unpooledQ05: q05, unpooledQ95: q95 });
      const weeksWithSpend = cell.weeksWithSpend[c] ?? 0;
      if (weeksWithSpend === 0) return; // no data on this channel in this cell: nothing to contradict the group
      const cac = (logB: number): string => (1 / Math.exp(logB)).toPrecision(3);
      if (mG < q05 || mG > q95) {
        outliers.push({
          cell: g,
          brand: cell.brand,
          market: cell.market,
          channel,
          reason: `On its own data, ${cell.brand} × ${cell.market} has a low-spend CAC for ${channel} of ${cac(q95)}–${cac(q05)} (90 % interval), which excludes the ${cell.brand}/${cell.market} group estimate of ${cac(mG)}.`,
        });
      } else if (shrink >= rule.largeShrinkage && weeksWithSpend >= rule.longDataWeeks && Math.abs(mU - mG) >= sdOf(eta, mU)) {
        outliers.push({
          cell: g,
          brand: cell.brand,
          market: cell.market,
          channel,
          reason: `Pooling moved ${cell.brand} × ${cell.market}'s ${channel} estimate ${(100 * shrink).toFixed(0)} % of the way to its group although it has ${weeksWithSpend} weeks with spend.`,
        });
      }
    });
  });
  const levels: LevelPooling[] = [];
  const levelSpec: ["brand" | "market" | "cell", string, number][] = [
    ["brand", "brandDeviation", inputs.brandCount],
    ["market", "marketDeviation", inputs.marketCount],
    ["cell", "cellDeviation", inputs.cells.length],
  ];
  for (const [level, base, units] of levelSpec) {
    if (!inputs.pooled.names.includes(`${base}[0,${inputs.channels[0]}]`)) continue;
    for (const channel of inputs.channels) {
      const D = pooled.drawCount;
      const matrix = new Float64Array(D * units);
      for (let j = 0; j < units; j++) {
        const col = pooled.column(`${base}[${j},${channel}]`);
        for (let d = 0; d < D; d++) matrix[d * units + j] = col[d]!;
      }
      levels.push({ level, channel, poolingFactor: poolingFactor(matrix, D, units) });
    }
  }
  return { cells, levels, candidateOutliers: outliers };
}

/** Shrinkage inputs from the portfolio data (training weeks as in the fit) and the two runs' draws. */
export function shrinkageInputsFrom(
  data: PortfolioData,
  options: PortfolioModelOptions,
  pooledDraws: NamedDraws,
  unpooledDraws: NamedDraws,
): ShrinkageInputs {
  const resolved = resolvePortfolioOptions(data.channels, options);
  const k = buildPortfolioConstants(data, resolved);
  return {
    channels: data.channels,
    cells: data.cells.map((cell, g) => ({
      brand: cell.brand,
      market: cell.market,
      trainWeeks: k.trainWeeks[g]!,
      weeksWithSpend: cell.spend.map((s) => {
        let n = 0;
        for (let t = 0; t < k.trainWeeks[g]!; t++) if (s[t]! > 0) n++;
        return n;
      }),
    })),
    brandCount: k.brands.length,
    marketCount: k.markets.length,
    pooled: pooledDraws,
    unpooled: unpooledDraws,
  };
}
