import { describe, expect, it } from "vitest";
import type { ChainResult, ParameterSummary, PortfolioData } from "@tributary/stats";
import { parameterLabeller, parameterTrace, thinnedDraws, worstParameters } from "./run-report-data";

function chain(chainIndex: number, names: string[], rows: number[][]): ChainResult {
  return { chain: chainIndex, names, draws: Float64Array.from(rows.flat()) } as unknown as ChainResult;
}

const summary = (name: string, rhat: number, essBulk: number): ParameterSummary =>
  ({ name, rhat, essBulk, mean: 0, sd: 1, q05: -1, q50: 0, q95: 1, essTail: essBulk, mcseMean: 0.1, mcseQ05: 0.1, mcseQ95: 0.1 }) as ParameterSummary;

describe("parameterTrace", () => {
  it("bins ranks over all chains per chain: separated chains pile up at opposite ends", () => {
    const chains = [chain(0, ["a"], [[1], [2], [3], [4]]), chain(1, ["a"], [[5], [6], [7], [8]])];
    const trace = parameterTrace(chains, summary("a", 1.5, 10), "highest R-hat", "a", 200, 2);
    expect(trace.rankCounts).toEqual([
      { chain: 0, counts: [4, 0] },
      { chain: 1, counts: [0, 4] },
    ]);
    expect(trace.chains[1]).toEqual({ chain: 1, iterations: [0, 1, 2, 3], values: [5, 6, 7, 8] });
  });

  it("averages tied ranks and thins the trace evenly", () => {
    const values = Array.from({ length: 10 }, (_, i) => [i % 2]);
    const chains = [chain(0, ["b", "a"], values.map((v) => [9, v[0]!]))];
    const trace = parameterTrace(chains, summary("a", 1, 100), "lowest bulk ESS", "a", 4, 2);
    // Five 0s share rank 3 (bin 0), five 1s share rank 8 (bin 1).
    expect(trace.rankCounts[0]!.counts).toEqual([5, 5]);
    expect(trace.chains[0]!.iterations).toEqual([0, 3, 6, 9]);
    expect(trace.chains[0]!.values).toEqual([0, 1, 0, 1]);
  });
});

describe("worstParameters", () => {
  it("takes the highest R-hats first, then the lowest bulk ESS, without repeats or undefined values", () => {
    const params = [summary("p1", 1.2, 500), summary("p2", 1.001, 30), summary("p3", 1.05, 40), summary("p4", Number.NaN, 1), summary("p5", 1.0, 900)];
    expect(worstParameters(params, 4)).toEqual([
      { name: "p1", why: "highest R-hat" },
      { name: "p3", why: "highest R-hat" },
      { name: "p2", why: "lowest bulk ESS" },
      { name: "p5", why: "lowest bulk ESS" },
    ]);
  });
});

describe("thinnedDraws", () => {
  it("keeps at most the asked total, evenly from every chain", () => {
    const rows = Array.from({ length: 10 }, (_, i) => [i, 100 + i]);
    const kept = thinnedDraws([chain(0, ["x", "y"], rows), chain(1, ["x", "y"], rows)], 10);
    expect(kept.map((k) => k.drawCount)).toEqual([5, 5]);
    expect(Array.from(kept[0]!.draws)).toEqual([0, 100, 2, 102, 4, 104, 6, 106, 8, 108]);
  });
});

describe("parameterLabeller", () => {
  it("names cells, brands and markets by the data's names", () => {
    const data = {
      channels: ["search"],
      controls: [],
      cells: [
        { brand: "Kestrova", market: "Veltria" },
        { brand: "Plumrise", market: "Solvera" },
      ],
    } as unknown as PortfolioData;
    const label = parameterLabeller(data);
    expect(label("beta[1,search]")).toBe("beta · Plumrise × Solvera · search");
    expect(label("marketDeviation[1,search]")).toBe("marketDeviation · Solvera · search");
    expect(label("gamma[0,2]")).toBe("gamma · Kestrova × Veltria · harmonic 2");
    expect(label("mu[search]")).toBe("mu · search");
    expect(label("nu")).toBe("nu");
  });
});
