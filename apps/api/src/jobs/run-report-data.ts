// The run report's data drawn from the pooled model's chains at the end of a fit: the
// per-parameter diagnostics table, and trace and rank-plot data for the parameters that
// converged worst (rank plots: Vehtari et al. 2021, "Rank-normalization, folding, and
// localization", section 4).
import type { ParameterDiagnostic, ParameterTrace } from "@tributary/contracts";
import type { ChainResult, ParameterSummary, PortfolioData } from "@tributary/stats";

/** Readable labels of the model's parameter names, e.g. "beta[3,search]" → "beta · Kestrova × Veltria · search". */
export function parameterLabeller(data: { readonly cells: readonly Pick<PortfolioData["cells"][number], "brand" | "market">[] }): (name: string) => string {
  const brands = [...new Set(data.cells.map((c) => c.brand))];
  const markets = [...new Set(data.cells.map((c) => c.market))];
  const cellLabel = (g: number) => {
    const cell = data.cells[g];
    return cell ? `${cell.brand} × ${cell.market}` : `cell ${g}`;
  };
  return (name) => {
    const match = /^([A-Za-z0-9]+)\[(\d+)(?:,(.+))?\]$/.exec(name);
    if (!match) {
      const channelOnly = /^([A-Za-z0-9]+)\[(.+)\]$/.exec(name);
      return channelOnly ? `${channelOnly[1]} · ${channelOnly[2]}` : name;
    }
    const [, base, index, rest] = match;
    const k = Number(index);
    const who = base === "brandDeviation" ? (brands[k] ?? `brand ${k}`) : base === "marketDeviation" ? (markets[k] ?? `market ${k}`) : cellLabel(k);
    const what = rest === undefined ? "" : /^\d+$/.test(rest) ? ` · harmonic ${rest}` : ` · ${rest}`;
    return `${base} · ${who}${what}`;
  };
}

export function parameterTable(parameters: readonly ParameterSummary[], label: (name: string) => string): ParameterDiagnostic[] {
  return parameters.map((p) => ({
    name: p.name,
    label: label(p.name),
    mean: p.mean,
    sd: p.sd,
    q05: p.q05,
    q50: p.q50,
    q95: p.q95,
    rhat: p.rhat,
    essBulk: p.essBulk,
    essTail: p.essTail,
    mcseMean: p.mcseMean,
  }));
}

/**
 * The parameters to plot: the highest R-hat first, then the lowest bulk ESS, without
 * repeats; parameters with a non-finite R-hat (constant draws) are left out.
 */
export function worstParameters(parameters: readonly ParameterSummary[], count: number): { name: string; why: string }[] {
  const finite = parameters.filter((p) => Number.isFinite(p.rhat) && Number.isFinite(p.essBulk));
  const byRhat = [...finite].sort((a, b) => b.rhat - a.rhat);
  const byEss = [...finite].sort((a, b) => a.essBulk - b.essBulk);
  const chosen: { name: string; why: string }[] = [];
  const seen = new Set<string>();
  const take = (p: ParameterSummary | undefined, why: string) => {
    if (!p || seen.has(p.name) || chosen.length >= count) return;
    seen.add(p.name);
    chosen.push({ name: p.name, why });
  };
  const half = Math.ceil(count / 2);
  for (let i = 0; i < half; i++) take(byRhat[i], "highest R-hat");
  for (let i = 0; chosen.length < count && i < byEss.length; i++) take(byEss[i], "lowest bulk ESS");
  return chosen;
}

function column(chain: ChainResult, index: number): Float64Array {
  const width = chain.names.length;
  const rows = width === 0 ? 0 : Math.floor(chain.draws.length / width);
  const out = new Float64Array(rows);
  for (let i = 0; i < rows; i++) out[i] = chain.draws[i * width + index]!;
  return out;
}

/** Ranks (1-based, ties averaged) of all values. */
function ranksOf(values: Float64Array): Float64Array {
  const order = Array.from(values.keys()).sort((a, b) => values[a]! - values[b]!);
  const ranks = new Float64Array(values.length);
  for (let i = 0; i < order.length; ) {
    let j = i;
    while (j + 1 < order.length && values[order[j + 1]!] === values[order[i]!]) j++;
    const rank = (i + j) / 2 + 1;
    for (let k = i; k <= j; k++) ranks[order[k]!] = rank;
    i = j + 1;
  }
  return ranks;
}

/** Trace points (thinned evenly to at most `maxPoints` per chain) and rank histograms of one parameter. */
export function parameterTrace(
  chains: readonly ChainResult[],
  summary: ParameterSummary,
  why: string,
  label: string,
  maxPoints = 200,
  bins = 20,
): ParameterTrace {
  const index = chains[0]!.names.indexOf(summary.name);
  const columns = chains.map((chain) => column(chain, index));
  const traces = columns.map((values, k) => {
    const step = Math.max(1, Math.ceil(values.length / maxPoints));
    const iterations: number[] = [];
    const kept: number[] = [];
    for (let i = 0; i < values.length; i += step) {
      iterations.push(i);
      kept.push(values[i]!);
    }
    return { chain: chains[k]!.chain, iterations, values: kept };
  });
  const all = new Float64Array(columns.reduce((n, c) => n + c.length, 0));
  let at = 0;
  for (const c of columns) {
    all.set(c, at);
    at += c.length;
  }
  const ranks = ranksOf(all);
  const total = all.length;
  const rankCounts = chains.map((chain) => ({ chain: chain.chain, counts: new Array<number>(bins).fill(0) }));
  at = 0;
  columns.forEach((c, k) => {
    for (let i = 0; i < c.length; i++) {
      const bin = Math.min(bins - 1, Math.floor(((ranks[at + i]! - 1) / total) * bins));
      rankCounts[k]!.counts[bin]! += 1;
    }
    at += c.length;
  });
  return { name: summary.name, label, rhat: summary.rhat, essBulk: summary.essBulk, why, chains: traces, rankBins: bins, rankCounts };
}

/** Draws kept for planning: every chain thinned evenly so that all chains together keep at most `total`. */
export function thinnedDraws(chains: readonly ChainResult[], total: number): { chain: number; names: string[]; drawCount: number; draws: Float64Array }[] {
  const perChain = Math.max(1, Math.floor(total / Math.max(1, chains.length)));
  return chains.map((chain) => {
    const width = chain.names.length;
    const rows = width === 0 ? 0 : Math.floor(chain.draws.length / width);
    const step = Math.max(1, Math.ceil(rows / perChain));
    const kept = Math.ceil(rows / step);
    const draws = new Float64Array(kept * width);
    for (let r = 0, k = 0; r < rows; r += step, k++) draws.set(chain.draws.subarray(r * width, (r + 1) * width), k * width);
    return { chain: chain.chain, names: [...chain.names], drawCount: kept, draws };
  });
}
