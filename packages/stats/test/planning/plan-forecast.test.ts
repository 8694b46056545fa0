import { describe, expect, it } from "vitest";
import { summariseDraws } from "../../src/decisions/draw-summary";
import { forecastSpendPlan } from "../../src/decisions/forecast";
import { createRandomSource } from "../../src/rng/create-random-source";
import { absoluteWeekOf } from "../../src/model/absolute-week";
import { costPerExtraCustomer } from "../../src/planning/cost-per-extra-customer";
import { comparePlans } from "../../src/planning/plan-comparison";
import { forecastPlan } from "../../src/planning/plan-forecast";
import { applyScenario } from "../../src/planning/scenario";
import { currentPlan, type SpendPlan } from "../../src/planning/spend-plan";
import { handDrawSet } from "./hand-draw-set";
import { twoCellDrawSet } from "./small-draw-sets";

const L = 4;
const { set, beta, theta, alpha, spendAN, spendBS } = twoCellDrawSet(L);

/**
 * The model's expected outcome in plan week h of plan cell i under draw d, computed
 * plainly from the formulas of the specification (no code of the package):
 *   baseline = level + β1·((t − (T − 1)/2)/52) + Σ_j γ_j·(sin(2πjw/52.1775) − mean) + δ_j·(cos(…) − mean)
 *   a[t] = Σ_{l=0}^{L−1} α^l·x[t−l] / Σ α^l   (x = history then plan, 0 before the first week)
 *   contribution = β·θ·(1 − exp(−a/θ))
 */
function directExpected(plan: SpendPlan, i: number, d: number, h: number): number {
  const g = plan.cells[i]!.cellIndex;
  const history = g === 0 ? spendAN : spendBS;
  const T = history[0]!.length;
  const t = T + h;
  const firstWeek = g === 0 ? "2024-01-01" : "2024-03-04";
  const w0 = absoluteWeekOf(firstWeek);
  const level = [400, 150][g]! + 10 * d;
  const b1 = [20, -5][g]! + d;
  let value = level + (b1 * (t - (T - 1) / 2)) / 52;
  for (let j = 1; j <= 2; j++) {
    const gamma = [12, 4][g]! / j + d;
    const delta = [-6, 3][g]! / j - d;
    let meanSin = 0;
    let meanCos = 0;
    for (let k = 0; k < T; k++) {
      meanSin += Math.sin((2 * Math.PI * j * (w0 + k)) / 52.1775) / T;
      meanCos += Math.cos((2 * Math.PI * j * (w0 + k)) / 52.1775) / T;
    }
    value += gamma * (Math.sin((2 * Math.PI * j * (w0 + t)) / 52.1775) - meanSin);
    value += delta * (Math.cos((2 * Math.PI * j * (w0 + t)) / 52.1775) - meanCos);
  }
  for (let c = 0; c < 2; c++) {
    const x = (week: number): number => {
      if (week < 0) return 0;
      if (week < T) return history[c]![week]!;
      return plan.spend[(i * 2 + c) * plan.horizon + (week - T)]!;
    };
    const a0 = alpha[d]![g]![c]!;
    let num = 0;
    let den = 0;
    for (let l = 0; l < L; l++) {
      num += a0 ** l * x(t - l);
      den += a0 ** l;
    }
    const a = num / den;
    const th = theta[d]![g]![c]!;
    value += beta[d]![g]![c]! * th * (1 - Math.exp(-a / th));
  }
  return value;
}

describe("plan forecast", () => {
  const base = currentPlan(set, { horizon: 6 });
  const scenario = applyScenario(base, [
    { kind: "scale", target: { channels: ["Search"] }, factor: 1.5 },
    { kind: "zero", target: { markets: ["Northland"], channels: ["Video"], weeks: { from: 0, to: 2 } } },
  ]);

  it("matches a direct computation from the model's formulas, week by week and draw by draw", () => {
    for (const plan of [base, scenario]) {
      const f = forecastPlan(set, plan, { seed: 3 });
      for (let i = 0; i < 2; i++) {
        const cell = f.cells[i]!;
        for (let d = 0; d < 3; d++) {
          let total = 0;
          for (let h = 0; h < 6; h++) {
            const direct = directExpected(plan, i, d, h);
            expect(cell.expected[d * 6 + h]).toBeCloseTo(direct, 8);
            total += direct;
          }
          expect(cell.expectedTotalDraws[d]).toBeCloseTo(total, 7);
        }
      }
    }
  });

  it("carries over the last L − 1 weeks of real spend into a plan of zero spend, then nothing", () => {
    const zero = applyScenario(base, [{ kind: "zero" }]);
    const f = forecastPlan(set, zero, { seed: 1 });
    const media = f.cells[0]!.weeks.map((w) => w.media.mean);
    for (let h = 0; h < L - 1; h++) expect(media[h]).toBeGreaterThan(1);
    for (let h = L - 1; h < 6; h++) expect(media[h]).toBeCloseTo(0, 9); // the truncated adstock recursion leaves ~1e-16
    expect(media[0]).toBeGreaterThan(media[1]!);
  });

  it("adds posterior predictive noise, shared between plans forecast with the same seed", () => {
    const a = forecastPlan(set, base, { seed: 11 });
    const b = forecastPlan(set, scenario, { seed: 11 });
    const c = forecastPlan(set, base, { seed: 12 });
    const noise = (f: typeof a, i: number, k: number): number => f.cells[i]!.replicated[k]! - f.cells[i]!.expected[k]!;
    for (let k = 0; k < 18; k++) {
      expect(noise(a, 0, k)).toBeCloseTo(noise(b, 0, k), 9);
      expect(noise(a, 0, k)).not.toBeCloseTo(noise(c, 0, k), 6);
    }
    // The week summaries are the summaries of the replicated draws.
    const column = Float64Array.from({ length: 3 }, (_, d) => a.cells[1]!.replicated[d * 6 + 4]!);
    expect(a.cells[1]!.weeks[4]!.outcome).toEqual(summariseDraws(column));
  });

  it("agrees with the single-cell forecast of the decisions module given the same noise stream", () => {
    const f = forecastPlan(set, scenario, { seed: 4 });
    for (let i = 0; i < 2; i++) {
      const rows = [0, 1].map((c) => Array.from({ length: 6 }, (_, h) => scenario.spend[(i * 2 + c) * 6 + h]!));
      const single = forecastSpendPlan(set, i, rows, createRandomSource(4, i));
      single.weeks.forEach((w, h) => {
        expect(f.cells[i]!.weeks[h]!.week).toBe(w.week);
        expect(f.cells[i]!.weeks[h]!.outcome.mean).toBeCloseTo(w.outcome.mean, 8);
        expect(f.cells[i]!.weeks[h]!.outcome.q95).toBeCloseTo(w.outcome.q95, 8);
      });
      expect(f.cells[i]!.total.q05).toBeCloseTo(single.total.q05, 8);
    }
  });

  it("draws noise with the fitted σ (many draws of one cell)", () => {
    const D = 4000;
    const one = handDrawSet({
      channels: ["Search"],
      cells: [{ brand: "Alder", market: "Northland", firstWeek: "2024-01-01", spend: [Array.from({ length: 12 }, () => 800)] }],
      draws: D,
      parameters: {
        beta: () => 0.01,
        theta: () => 2000,
        alpha: () => 0.5,
        baselineLevel: () => 100,
        beta1: () => 0,
        gamma: () => 0,
        delta: () => 0,
        sigma: () => 20,
      },
    });
    const f = forecastPlan(one, currentPlan(one, { horizon: 2 }), { seed: 5 });
    const noise = Float64Array.from({ length: D }, (_, d) => f.cells[0]!.replicated[d * 2]! - f.cells[0]!.expected[d * 2]!);
    const s = summariseDraws(noise);
    // Standard error of an sd estimate from 4000 normal draws ≈ 20/√8000 ≈ 0.22; of the mean ≈ 0.32.
    expect(Math.abs(s.sd - 20)).toBeLessThan(1);
    expect(Math.abs(s.mean)).toBeLessThan(1.3);
  });

  it("sums cells into the selection, draw by draw and week by week", () => {
    const f = forecastPlan(set, scenario, { seed: 2 });
    for (let d = 0; d < 3; d++) {
      expect(f.selection.totalDraws[d]).toBeCloseTo(f.cells[0]!.totalDraws[d]! + f.cells[1]!.totalDraws[d]!, 9);
      expect(f.selection.expectedTotalDraws[d]).toBeCloseTo(f.cells[0]!.expectedTotalDraws[d]! + f.cells[1]!.expectedTotalDraws[d]!, 9);
    }
    expect(f.selection.totalSpend).toBeCloseTo(scenario.spend.reduce((a, b) => a + b, 0), 6);
    expect(f.selection.weeks[3]!.spend).toBeCloseTo(f.cells[0]!.weeks[3]!.spend + f.cells[1]!.weeks[3]!.spend, 9);
    expect(f.cells[0]!.weeks[0]!.week).toBe("2024-05-20");
    expect(f.note).toMatch(/lift test/);
  });

  it("rejects a plan that does not fit the run, and a bad seed", () => {
    expect(() => forecastPlan(set, { ...base, spend: base.spend.subarray(1) })).toThrow(/weekly spend values/);
    expect(() => forecastPlan(set, { ...base, channels: ["Search", "Radio"] })).toThrow(/not the run's channels/);
    expect(() => forecastPlan(set, base, { seed: -1 })).toThrow(/seed/);
  });
});

describe("scenario against the current plan", () => {
  const base = currentPlan(set, { horizon: 6 });

  it("gives the extra customers draw by draw, with the noise cancelled", () => {
    const more = applyScenario(base, [{ kind: "add", target: { channels: ["Search"] }, amountPerWeek: 500 }]);
    const cmp = comparePlans(set, base, more, { seed: 9 });
    expect(cmp.selection.extraSpend).toBeCloseTo(2 * 6 * 500, 8);
    for (let d = 0; d < 3; d++) {
      let direct = 0;
      for (let i = 0; i < 2; i++) for (let h = 0; h < 6; h++) direct += directExpected(more, i, d, h) - directExpected(base, i, d, h);
      expect(cmp.selection.extraCustomerDraws[d]).toBeCloseTo(direct, 7);
      // with common random numbers the difference of the noisy totals is the same
      expect(cmp.scenario.selection.totalDraws[d]! - cmp.reference.selection.totalDraws[d]!).toBeCloseTo(direct, 7);
    }
    expect(cmp.selection.extraCustomers.q05).toBeGreaterThan(0);
    expect(cmp.selection.costPerExtraCustomer.kind).toBe("cost");
    const cost = cmp.selection.costPerExtraCustomer;
    if (cost.kind === "cost") {
      const ratios = Array.from(cmp.selection.extraCustomerDraws, (x) => 6000 / x).sort((a, b) => a - b);
      expect(cost.interval.q50).toBeCloseTo(ratios[1]!, 8);
      expect(cost.interval.q05).toBeGreaterThanOrEqual(ratios[0]! - 1e-9);
      expect(cost.interval.unboundedShare).toBe(0);
    }
    expect(cmp.cells[1]!.extraSpend).toBeCloseTo(3000, 8);
  });

  it("says spend saved per customer lost for a cut", () => {
    const cut = applyScenario(base, [{ kind: "scale", target: { markets: ["Northland"] }, factor: 0.5 }]);
    const cmp = comparePlans(set, base, cut);
    expect(cmp.cells[0]!.costPerExtraCustomer.kind).toBe("saving-per-customer-lost");
    expect(cmp.cells[1]!.extraSpend).toBe(0);
  });

  it("rejects plans over different cells or horizons", () => {
    expect(() => comparePlans(set, base, currentPlan(set, { horizon: 5 }))).toThrow(/different horizons/);
    expect(() => comparePlans(set, base, currentPlan(set, { horizon: 6, cells: [{ brand: "Alder", market: "Northland" }] }))).toThrow(/different cells/);
  });
});

describe("cost per extra customer", () => {
  it("is undefined when the extra customers' 90 % interval includes 0", () => {
    const draws = Float64Array.from({ length: 100 }, (_, d) => d - 10); // q05 < 0 < q95
    const r = costPerExtraCustomer(1000, draws);
    expect(r.kind).toBe("undefined");
    expect(r.text).toMatch(/unbounded/);
    expect("interval" in r).toBe(false);
  });

  it("names the four signed cases and gives exact quantiles of the ratio", () => {
    const up = Float64Array.from({ length: 101 }, (_, d) => 10 + d); // 10..110
    const c = costPerExtraCustomer(1100, up);
    expect(c.kind).toBe("cost");
    if (c.kind === "cost") {
      expect(c.interval.q50).toBeCloseTo(1100 / 60, 12); // median of 1100/x is 1100/median(x)
      expect(c.interval.q05).toBeCloseTo(1100 / 105, 12);
      expect(c.interval.q95).toBeCloseTo(1100 / 15, 12);
    }
    expect(costPerExtraCustomer(-500, up).kind).toBe("more-customers-for-less");
    expect(costPerExtraCustomer(0, up).kind).toBe("more-customers-for-less");
    const down = Float64Array.from(up, (x) => -x);
    const s = costPerExtraCustomer(-1100, down);
    expect(s.kind).toBe("saving-per-customer-lost");
    if (s.kind === "saving-per-customer-lost") expect(s.interval.q50).toBeCloseTo(1100 / 60, 12);
    expect(costPerExtraCustomer(200, down).kind).toBe("fewer-customers-for-more");
  });

  it("counts draws with no extra customers as unbounded instead of dividing by them", () => {
    // 5 of 100 draws lose a customer: the 5 % quantile of the extra customers is still
    // above 0 (−1 + 0.95·51), so there is a cost, but its 95 % quantile is unbounded.
    const mostly = Float64Array.from({ length: 100 }, (_, d) => (d < 5 ? -1 : 50));
    const c = costPerExtraCustomer(500, mostly);
    expect(c.kind).toBe("cost");
    if (c.kind === "cost") {
      expect(c.interval.unboundedShare).toBeCloseTo(0.05, 12);
      expect(c.interval.q95).toBe(Infinity);
      expect(c.interval.q50).toBe(10);
      expect(c.interval.q05).toBe(10);
    }
    expect(() => costPerExtraCustomer(Number.NaN, mostly)).toThrow(/extra spend/);
  });
});
