import solver from "javascript-lp-solver";
import { describe, expect, it } from "vitest";
import type { DrawSet } from "../../src/decisions/draw-set";
import { budgetSplit, budgetSplitPlan, type BudgetSplitResult } from "../../src/planning/budget-split";
import { forecastPlan } from "../../src/planning/plan-forecast";
import { createRandomSource } from "../../src/rng/create-random-source";
import { scatteredDrawSet } from "./hand-draw-set";

/** E_d of a line's steady-state weekly response at weekly spend s, summed plainly over the draws. */
function expectedResponse(set: DrawSet, g: number, c: number, s: number): number {
  let sum = 0;
  for (let d = 0; d < set.drawCount; d++) {
    const at = (d * set.cells.length + g) * set.channels.length + c;
    const b = set.beta[at]!;
    const th = set.theta[at]!;
    if (set.saturation === "exponential") sum += b * th * (1 - Math.exp(-s / th));
    else {
      const k = set.hillShape[at]!;
      sum += s > 0 ? (b * th * s ** k) / (s ** k + th ** k) : 0;
    }
  }
  return sum / set.drawCount;
}

/** E_d of a line's marginal return β·exp(−s/θ) at weekly spend s. */
function expectedMarginal(set: DrawSet, g: number, c: number, s: number): number {
  let sum = 0;
  for (let d = 0; d < set.drawCount; d++) {
    const at = (d * set.cells.length + g) * set.channels.length + c;
    sum += set.beta[at]! * Math.exp(-s / set.theta[at]!);
  }
  return sum / set.drawCount;
}

const H = 13;
const channels3 = ["Search", "Video", "Radio"];
// One invented cell with three channels and 40 posterior draws.
const oneCell = scatteredDrawSet(createRandomSource(21), 1, channels3, 40);
// Two cells × two channels = four lines.
const twoCells = scatteredDrawSet(createRandomSource(22), 2, ["Search", "Video"], 30);

function weekly(result: BudgetSplitResult): number[] {
  return result.lines.map((l) => l.weeklyAllocation);
}

describe("budget split, expected new customers", () => {
  it("matches a fine grid over the budget line for two lines", () => {
    const set = scatteredDrawSet(createRandomSource(5), 1, ["Search", "Video"], 50);
    const total = 2 * 2500 * H;
    const r = budgetSplit(set, { totalBudget: total, horizon: H });
    const W = total / H;
    const N = 20000;
    let best = -Infinity;
    let bestS = 0;
    for (let i = 0; i <= N; i++) {
      const s = (W * i) / N;
      const v = H * (expectedResponse(set, 0, 0, s) + expectedResponse(set, 0, 1, W - s));
      if (v > best) {
        best = v;
        bestS = s;
      }
    }
    const ours = H * (expectedResponse(set, 0, 0, weekly(r)[0]!) + expectedResponse(set, 0, 1, weekly(r)[1]!));
    expect(ours).toBeGreaterThanOrEqual(best - 1e-9 * best);
    expect(Math.abs(weekly(r)[0]! - bestS)).toBeLessThanOrEqual(2 * (W / N));
    expect(r.customers.allocation.mean).toBeCloseTo(ours, 8);
    expect(r.exact).toBe(true);
  });

  it("matches a fine grid over the simplex for three lines, with bounds", () => {
    const total = 3 * 2000 * H;
    const W = total / H;
    const bounds = [
      { target: { channels: ["Search"] }, lower: 0.4 * total },
      { target: { channels: ["Radio"] }, upper: 0.1 * total },
    ];
    const r = budgetSplit(oneCell, { totalBudget: total, horizon: H, bounds });
    const lo = [0.4 * W, 0, 0];
    const hi = [W, W, 0.1 * W];
    const N = 500;
    let best = -Infinity;
    let arg = [0, 0, 0];
    for (let i = 0; i <= N; i++) {
      for (let j = 0; i + j <= N; j++) {
        const s = [(W * i) / N, (W * j) / N, (W * (N - i - j)) / N];
        if (s.some((x, k) => x < lo[k]! - 1e-9 || x > hi[k]! + 1e-9)) continue;
        const v = H * s.reduce((acc, x, k) => acc + expectedResponse(oneCell, 0, k, x), 0);
        if (v > best) {
          best = v;
          arg = s;
        }
      }
    }
    const ours = H * weekly(r).reduce((acc, x, k) => acc + expectedResponse(oneCell, 0, k, x), 0);
    expect(ours).toBeGreaterThanOrEqual(best - 1e-9 * best);
    weekly(r).forEach((x, k) => expect(Math.abs(x - arg[k]!)).toBeLessThanOrEqual(3 * (W / N)));
  });

  it("gives every line not at a bound the same expected marginal return, and respects bounds and total", () => {
    const total = 4 * 3000 * H;
    const r = budgetSplit(twoCells, {
      totalBudget: total,
      horizon: H,
      bounds: [
        { target: { cells: [{ brand: "Alder", market: "Northland" }], channels: ["Video"] }, upper: 1000 * H },
        { target: { channels: ["Search"] }, lower: 500 * H },
      ],
    });
    expect(r.allocatedTotal).toBeCloseTo(total, 6);
    expect(Math.abs(r.lines.reduce((a, l) => a + l.allocation, 0) - total) / total).toBeLessThan(1e-12);
    expect(r.equalMarginalSpread).toBeLessThan(1e-9);
    for (const line of r.lines) {
      expect(line.allocation).toBeGreaterThanOrEqual(line.lower - 1e-9);
      expect(line.allocation).toBeLessThanOrEqual(line.upper + 1e-9);
      // the marginal return reported is E_d β·exp(−s/θ), computed here independently
      const m = expectedMarginal(twoCells, line.cellIndex, line.channelIndex, line.weeklyAllocation);
      expect(line.marginalReturn).toBeCloseTo(m, 12);
      expect(line.marginalCac).toBeCloseTo(1 / m, 6);
      // KKT: equal to the multiplier inside the bounds, below it at a lower bound, above it at an upper one
      if (line.activeBound === null) expect(Math.abs(m - r.multiplier) / r.multiplier).toBeLessThan(1e-9);
      if (line.activeBound === "lower") expect(m).toBeLessThanOrEqual(r.multiplier * (1 + 1e-9));
      if (line.activeBound === "upper") expect(m).toBeGreaterThanOrEqual(r.multiplier * (1 - 1e-9));
    }
    const video = r.lines.find((l) => l.brand === "Alder" && l.channel === "Video")!;
    expect(video.allocation).toBeLessThanOrEqual(1000 * H + 1e-9);
    expect(r.linesAtBounds).toEqual(r.lines.flatMap((l, i) => (l.activeBound ? [i] : [])));
  });

  it("converges to the LP solution of the piecewise-linear problem as the segments get finer", () => {
    // Independent check with a general-purpose simplex solver: javascript-lp-solver 1.0.3
    // (npm, devDependency). Each line's expected response on [lower, upper] is replaced by
    // K linear segments (chords); the LP chooses how far to fill each segment.
    const total = 3 * 1800 * H;
    const W = total / H;
    const lower = [200, 0, 0];
    const upper = [W, 0.6 * W, W];
    const r = budgetSplit(oneCell, {
      totalBudget: total,
      horizon: H,
      bounds: [
        { target: { channels: ["Search"] }, lower: 200 * H },
        { target: { channels: ["Video"] }, upper: 0.6 * total },
      ],
    });
    const ours = weekly(r);
    const oursValue = ours.reduce((a, x, k) => a + expectedResponse(oneCell, 0, k, x), 0);
    const errors: number[] = [];
    const gaps: number[] = [];
    for (const K of [4, 16, 64]) {
      const variables: Record<string, Record<string, number>> = {};
      const constraints: Record<string, { min?: number; max?: number; equal?: number }> = { budget: { equal: W - lower.reduce((a, b) => a + b, 0) } };
      for (let l = 0; l < 3; l++) {
        for (let k = 0; k < K; k++) {
          const a = lower[l]! + ((upper[l]! - lower[l]!) * k) / K;
          const b = lower[l]! + ((upper[l]! - lower[l]!) * (k + 1)) / K;
          const slope = (expectedResponse(oneCell, 0, l, b) - expectedResponse(oneCell, 0, l, a)) / (b - a);
          const name = `x_${l}_${k}`;
          constraints[`cap_${l}_${k}`] = { max: b - a };
          variables[name] = { gain: 1000 * slope, budget: 1, [`cap_${l}_${k}`]: 1 };
        }
      }
      const lp = solver.Solve({ optimize: "gain", opType: "max", constraints, variables }) as Record<string, number | boolean | undefined>;
      expect(lp.feasible).toBe(true);
      const lpSpend = [0, 1, 2].map((l) => {
        let s = lower[l]!;
        for (let k = 0; k < K; k++) s += Number(lp[`x_${l}_${k}`] ?? 0);
        return s;
      });
      expect(lpSpend.reduce((a, b) => a + b, 0)).toBeCloseTo(W, 3);
      const width = Math.max(...upper.map((u, l) => (u - lower[l]!) / K));
      const error = Math.max(...lpSpend.map((s, l) => Math.abs(s - ours[l]!)));
      // The LP optimum equalises chord slopes, so it lies within about one segment of ours.
      expect(error).toBeLessThanOrEqual(2 * width);
      errors.push(error);
      // Ours is the optimum of the smooth problem: the LP's spend can do no better on it.
      const lpValue = lpSpend.reduce((a, x, k) => a + expectedResponse(oneCell, 0, k, x), 0);
      expect(oursValue).toBeGreaterThanOrEqual(lpValue - 1e-9 * oursValue);
      gaps.push(oursValue - lpValue);
    }
    expect(errors[2]!).toBeLessThan(errors[0]!);
    expect(gaps[2]!).toBeLessThanOrEqual(gaps[0]!);
    expect(errors[2]!).toBeLessThan(0.05 * W);
  });

  it("reports the current allocation, the outcome distribution and a histogram", () => {
    const total = 4 * 2000 * H;
    const r = budgetSplit(twoCells, { totalBudget: total, horizon: H, histogramBins: 12 });
    const D = twoCells.drawCount;
    expect(r.outcome.allocation.draws.length).toBe(D);
    expect(r.outcome.allocation.histogram.counts.reduce((a, b) => a + b, 0)).toBe(D);
    expect(r.outcome.current.histogram.edges).toBe(r.outcome.allocation.histogram.edges);
    expect(r.outcome.allocation.histogram.edges.length).toBe(13);
    // current spend = average of the last 13 weeks of each line, over the horizon
    const line = r.lines[3]!;
    const series = twoCells.cells[1]!.spend[1]!;
    const recent = Array.from(series.subarray(series.length - 13)).reduce((a, b) => a + b, 0) / 13;
    expect(line.current).toBeCloseTo(recent * H, 6);
    // the customers of the allocation, draw by draw, plainly
    let direct = 0;
    for (const l of r.lines) direct += H * expectedResponse(twoCells, l.cellIndex, l.channelIndex, l.weeklyAllocation);
    expect(r.customers.allocation.mean).toBeCloseTo(direct, 6);
    expect(r.outcome.allocation.mean).toBeCloseTo(direct, 6);
    expect(r.customers.difference.mean).toBeCloseTo(r.customers.allocation.mean - r.customers.current.mean, 6);
    expect(r.profit).toBeNull();
    expect(r.notes.join(" ")).toMatch(/lift test/);
    expect(r.notes.join(" ")).toMatch(/steady-state/);
  });

  it("turns the allocation into a spend plan the forecast accepts", () => {
    const r = budgetSplit(twoCells, { totalBudget: 4 * 2000 * H, horizon: 6 });
    const plan = budgetSplitPlan(twoCells, r);
    expect(plan.horizon).toBe(6);
    expect(plan.spend.reduce((a, b) => a + b, 0)).toBeCloseTo(4 * 2000 * H, 6);
    const f = forecastPlan(twoCells, plan);
    expect(f.selection.totalSpend).toBeCloseTo(4 * 2000 * H, 6);
  });
});

describe("budget split, expected profit", () => {
  it("leaves budget unspent where value × marginal return falls below 1, and matches a grid", () => {
    const set = scatteredDrawSet(createRandomSource(5), 1, ["Search", "Video"], 50);
    const value = 150;
    const total = 2 * 20000 * H; // more than is worth spending
    const r = budgetSplit(set, { totalBudget: total, horizon: H, objective: { kind: "profit", customerValue: { Alder: value } } });
    expect(r.budgetBinding).toBe(false);
    expect(r.allocatedTotal).toBeLessThan(total);
    expect(r.multiplier).toBe(1);
    expect(r.notes.join(" ")).toMatch(/left unspent/);
    for (const line of r.lines) if (line.activeBound === null) expect(Math.abs(value * line.marginalReturn - 1)).toBeLessThan(1e-9);
    const W = total / H;
    const profit = (s: number[]): number => H * (value * (expectedResponse(set, 0, 0, s[0]!) + expectedResponse(set, 0, 1, s[1]!)) - s[0]! - s[1]!);
    const N = 600;
    let best = -Infinity;
    for (let i = 0; i <= N; i++) for (let j = 0; i + j <= N; j++) best = Math.max(best, profit([(W * i) / N, (W * j) / N]));
    expect(profit(weekly(r))).toBeGreaterThanOrEqual(best - 1e-9 * Math.abs(best));
    expect(r.profit!.allocation.mean).toBeCloseTo(profit(weekly(r)), 6);
  });

  it("spends the whole budget when it is worth it, with a multiplier above 1", () => {
    const r = budgetSplit(twoCells, { totalBudget: 4 * 800 * H, horizon: H, objective: { kind: "profit", customerValue: { Alder: 400, Birchwood: 300 } } });
    expect(r.budgetBinding).toBe(true);
    expect(r.allocatedTotal).toBeCloseTo(4 * 800 * H, 6);
    expect(r.multiplier).toBeGreaterThan(1);
    expect(r.equalMarginalSpread).toBeLessThan(1e-9);
    for (const line of r.lines) if (line.activeBound === null) expect(line.weightedMarginalReturn).toBeCloseTo(r.multiplier, 9);
  });
});

describe("budget split with a risk attitude", () => {
  const total = 4 * 2500 * H;
  const bounds = [{ target: { channels: ["Video"] }, upper: 0.3 * total }];

  function criterionDirect(set: DrawSet, r: BudgetSplitResult, spend: number[], kind: "q10" | "msd"): number {
    const D = set.drawCount;
    const y = Array.from({ length: D }, (_, d) => {
      let v = 0;
      r.lines.forEach((l, k) => {
        const at = (d * set.cells.length + l.cellIndex) * set.channels.length + l.channelIndex;
        const th = set.theta[at]!;
        v += H * set.beta[at]! * th * (1 - Math.exp(-spend[k]! / th));
      });
      return v;
    }).sort((a, b) => a - b);
    if (kind === "q10") {
      const h = (D - 1) * 0.1;
      const lo = Math.floor(h);
      return y[lo]! + (h - lo) * (y[lo + 1]! - y[lo]!);
    }
    const mean = y.reduce((a, b) => a + b, 0) / D;
    const sd = Math.sqrt(y.reduce((a, b) => a + (b - mean) ** 2, 0) / (D - 1));
    return mean - 1.5 * sd;
  }

  it("maximises the 10 % quantile: feasible, and at least as good as the expected-value split on it", () => {
    const r = budgetSplit(twoCells, { totalBudget: total, horizon: H, bounds, risk: { kind: "lower-quantile", quantile: 0.1 } });
    expect(r.exact).toBe(false);
    expect(r.method).toMatch(/approximate/);
    expect(Math.abs(r.allocatedTotal - total) / total).toBeLessThan(1e-12);
    for (const l of r.lines) {
      expect(l.allocation).toBeGreaterThanOrEqual(-1e-9);
      expect(l.allocation).toBeLessThanOrEqual(l.upper + 1e-9);
    }
    const ev = Array.from(r.expectedValueAllocation!, (x) => x / H);
    const mine = criterionDirect(twoCells, r, weekly(r), "q10");
    const theirs = criterionDirect(twoCells, r, ev, "q10");
    expect(r.riskCriterion!.allocation).toBeCloseTo(mine, 6);
    expect(r.riskCriterion!.expectedValueSolution).toBeCloseTo(theirs, 6);
    expect(mine).toBeGreaterThanOrEqual(theirs);
    // and the expected-value split itself is the exact expected optimum
    const evOnly = budgetSplit(twoCells, { totalBudget: total, horizon: H, bounds });
    weekly(evOnly).forEach((x, k) => expect(x).toBeCloseTo(ev[k]!, 6));
  });

  it("maximises mean − k·sd: feasible, and at least as good as the expected-value split on it", () => {
    const r = budgetSplit(twoCells, { totalBudget: total, horizon: H, bounds, risk: { kind: "mean-minus-sd", penalty: 1.5 } });
    expect(Math.abs(r.allocatedTotal - total) / total).toBeLessThan(1e-12);
    for (const l of r.lines) expect(l.allocation).toBeLessThanOrEqual(l.upper + 1e-9);
    const ev = Array.from(r.expectedValueAllocation!, (x) => x / H);
    const mine = criterionDirect(twoCells, r, weekly(r), "msd");
    const theirs = criterionDirect(twoCells, r, ev, "msd");
    expect(r.riskCriterion!.allocation).toBeCloseTo(mine, 6);
    expect(mine).toBeGreaterThanOrEqual(theirs);
    expect(mine).toBeGreaterThan(theirs + 1e-6 * Math.abs(theirs)); // a real gain on this problem
  });

  it("with no penalty on the spread, stays at the expected-value optimum", () => {
    const r = budgetSplit(twoCells, { totalBudget: total, horizon: H, bounds, risk: { kind: "mean-minus-sd", penalty: 0 } });
    const ev = Array.from(r.expectedValueAllocation!, (x) => x / H);
    expect(Math.abs(r.riskCriterion!.allocation - r.riskCriterion!.expectedValueSolution) / r.riskCriterion!.allocation).toBeLessThan(1e-9);
    weekly(r).forEach((x, k) => expect(Math.abs(x - ev[k]!)).toBeLessThan(1e-3 * (total / H)));
  });

  it("keeps a profit split within the budget under a risk attitude", () => {
    const r = budgetSplit(twoCells, {
      totalBudget: total,
      horizon: H,
      objective: { kind: "profit", customerValue: { Alder: 200, Birchwood: 150 } },
      risk: { kind: "lower-quantile", quantile: 0.2 },
    });
    expect(r.allocatedTotal).toBeLessThanOrEqual(total * (1 + 1e-12));
    expect(r.riskCriterion!.allocation).toBeGreaterThanOrEqual(r.riskCriterion!.expectedValueSolution);
  });
});

describe("budget split with the Hill form", () => {
  it("is exact when every draw is concave (shape ≤ 1) and matches a grid", () => {
    const set = scatteredDrawSet(createRandomSource(8), 1, ["Search", "Video"], 40, "hill");
    const concave: DrawSet = { ...set, hillShape: set.hillShape.map((k) => Math.min(k, 1)) };
    const total = 2 * 2000 * H;
    const r = budgetSplit(concave, { totalBudget: total, horizon: H });
    expect(r.exact).toBe(true);
    expect(r.equalMarginalSpread).toBeLessThan(1e-9);
    const W = total / H;
    let best = -Infinity;
    for (let i = 0; i <= 20000; i++) {
      const s = (W * i) / 20000;
      best = Math.max(best, expectedResponse(concave, 0, 0, s) + expectedResponse(concave, 0, 1, W - s));
    }
    const ours = expectedResponse(concave, 0, 0, weekly(r)[0]!) + expectedResponse(concave, 0, 1, weekly(r)[1]!);
    expect(ours).toBeGreaterThanOrEqual(best - 1e-9 * best);
  });

  it("flags S-shaped responses as approximate and still finds the grid's best on a small problem", () => {
    const set = scatteredDrawSet(createRandomSource(9), 1, ["Search", "Video", "Radio"], 40, "hill");
    const steep: DrawSet = { ...set, hillShape: set.hillShape.map((k) => 1.5 * k) };
    const total = 3 * 1500 * H;
    const r = budgetSplit(steep, { totalBudget: total, horizon: H });
    expect(r.exact).toBe(false);
    expect(r.notes.join(" ")).toMatch(/S-shaped/);
    expect(Math.abs(r.allocatedTotal - total) / total).toBeLessThan(1e-12);
    const W = total / H;
    const N = 300;
    let best = -Infinity;
    for (let i = 0; i <= N; i++) {
      for (let j = 0; i + j <= N; j++) {
        const s = [(W * i) / N, (W * j) / N, (W * (N - i - j)) / N];
        best = Math.max(best, s.reduce((a, x, k) => a + expectedResponse(steep, 0, k, x), 0));
      }
    }
    const ours = weekly(r).reduce((a, x, k) => a + expectedResponse(steep, 0, k, x), 0);
    expect(ours).toBeGreaterThanOrEqual(best * (1 - 1e-6));
  });
});

describe("budget split input errors", () => {
  const total = 4 * 1000 * H;
  it("rejects infeasible bounds", () => {
    expect(() => budgetSplit(twoCells, { totalBudget: total, bounds: [{ lower: 0.3 * total }] })).toThrow(/lower bounds add up to .*more than the total budget/);
    expect(() => budgetSplit(twoCells, { totalBudget: total, bounds: [{ upper: 0.2 * total }] })).toThrow(/upper bounds add up to .*less than the total budget/);
    expect(() =>
      budgetSplit(twoCells, { totalBudget: total, bounds: [{ target: { channels: ["Search"] }, lower: 5000 }, { target: { markets: ["Northland"] }, upper: 4000 }] }),
    ).toThrow(/bounds on Alder × Northland, Search contradict each other/);
    expect(() => budgetSplit(twoCells, { totalBudget: total, bounds: [{ lower: 10, upper: 5 }] })).toThrow(/lower bound 10 is above the upper bound 5/);
  });

  it("rejects negative numbers and unknown lines", () => {
    expect(() => budgetSplit(twoCells, { totalBudget: -5 })).toThrow(/total budget must be a positive number/);
    expect(() => budgetSplit(twoCells, { totalBudget: Number.NaN })).toThrow(/total budget/);
    expect(() => budgetSplit(twoCells, { totalBudget: total, bounds: [{ lower: -1 }] })).toThrow(/lower bound must be a number ≥ 0/);
    expect(() => budgetSplit(twoCells, { totalBudget: total, bounds: [{ upper: -1 }] })).toThrow(/upper bound must be a number ≥ 0/);
    expect(() => budgetSplit(twoCells, { totalBudget: total, bounds: [{ target: { channels: ["Cinema"] }, upper: 1 }] })).toThrow(/channel "Cinema" is not among the planned channels/);
    expect(() => budgetSplit(twoCells, { totalBudget: total, cells: [{ brand: "Nobody", market: "Northland" }] })).toThrow(/no cell Nobody × Northland/);
    expect(() => budgetSplit(twoCells, { totalBudget: total, horizon: 0 })).toThrow(/budget horizon/);
  });

  it("rejects a missing or unknown customer value and a bad risk setting", () => {
    expect(() => budgetSplit(twoCells, { totalBudget: total, objective: { kind: "profit", customerValue: { Alder: 100 } } })).toThrow(/brand Birchwood/);
    expect(() => budgetSplit(twoCells, { totalBudget: total, objective: { kind: "profit", customerValue: { Alder: 100, Birchwood: 90, Quercus: 5 } } })).toThrow(/brand "Quercus"/);
    expect(() => budgetSplit(twoCells, { totalBudget: total, objective: { kind: "profit", customerValue: { Alder: -100, Birchwood: 90 } } })).toThrow(/positive value/);
    expect(() => budgetSplit(twoCells, { totalBudget: total, risk: { kind: "lower-quantile", quantile: 1.2 } })).toThrow(/quantile must be between 0 and 1/);
    expect(() => budgetSplit(twoCells, { totalBudget: total, risk: { kind: "mean-minus-sd", penalty: -1 } })).toThrow(/penalty/);
  });

  it("handles a budget exactly at the bounds' sum", () => {
    const r = budgetSplit(twoCells, { totalBudget: total, bounds: [{ lower: total / 4 }] });
    for (const l of r.lines) {
      expect(l.allocation).toBeCloseTo(total / 4, 9);
      expect(l.activeBound).toBe("lower");
    }
  });
});
