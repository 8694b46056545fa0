import type { PortfolioData } from "../data/portfolio-data";
import type { ParameterSummary } from "../diagnostics/summarise-run";
import type { ChannelResult, PosteriorSummary } from "./fit-result";

export function posteriorSummary(p: ParameterSummary): PosteriorSummary {
  return { mean: p.mean, sd: p.sd, q05: p.q05, q50: p.q50, q95: p.q95, rhat: p.rhat, essBulk: p.essBulk };
}

/** Parameter summaries looked up by name. */
export class SummaryTable {
  private readonly byName: Map<string, ParameterSummary>;
  constructor(parameters: readonly ParameterSummary[]) {
    this.byName = new Map(parameters.map((p) => [p.name, p]));
  }
  find(name: string): PosteriorSummary | null {
    const p = this.byName.get(name);
    return p === undefined ? null : posteriorSummary(p);
  }
  get(name: string): PosteriorSummary {
    const p = this.find(name);
    if (p === null) throw new Error(`the fit has no parameter named "${name}"`);
    return p;
  }
}

/** Channel-level parameters of the pooled model, one row per channel. */
export function channelResults(channels: readonly string[], pooled: SummaryTable): ChannelResult[] {
  return channels.map((channel) => ({
    channel,
    mu: pooled.get(`mu[${channel}]`),
    tauBrand: pooled.find(`tauBrand[${channel}]`),
    tauMarket: pooled.find(`tauMarket[${channel}]`),
    tauCell: pooled.get(`tauCell[${channel}]`),
    alpha: pooled.get(`alpha[${channel}]`),
    lambda: pooled.get(`lambda[${channel}]`),
  }));
}

/** True when cell g spent on channel c in any week. */
export function cellHasSpend(data: PortfolioData, g: number, c: number): boolean {
  const series = data.cells[g]?.spend[c];
  if (series === undefined) return false;
  for (let t = 0; t < series.length; t++) if (series[t]! > 0) return true;
  return false;
}
