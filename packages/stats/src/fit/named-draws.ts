import type { NamedDraws } from "../decisions/draw-set";
import { combineIndependentDraws } from "../model/portfolio/build-portfolio-model";
import type { ChainResult } from "../sampler/sampler-settings";

/** The draws of all chains of one run, stacked chain after chain under the run's names. */
export function stackChains(chains: readonly ChainResult[]): NamedDraws {
  const first = chains[0];
  if (first === undefined) throw new RangeError("stackChains: no chains");
  const total = chains.reduce((sum, c) => sum + c.draws.length, 0);
  const draws = new Float64Array(total);
  let at = 0;
  for (const c of chains) {
    draws.set(c.draws, at);
    at += c.draws.length;
  }
  return { names: first.names, draws };
}

/** The no-pooling runs of all cells side by side: draw i of every cell's run in row i. */
export function joinCellRuns(runs: readonly (readonly ChainResult[])[]): NamedDraws {
  const joined = combineIndependentDraws(runs.map(stackChains));
  return { names: joined.names, draws: joined.draws };
}
