import { describeTarget, matchLines, type LineTarget } from "./line-target";
import { cellLabel } from "./plan-cells";
import { planIndex, type SpendPlan } from "./spend-plan";

/** Lines (cell × channel) and, optionally, plan weeks an operation changes. */
export interface ScenarioTarget extends LineTarget {
  /** Plan weeks changed, 0-based and inclusive (default: every plan week). */
  readonly weeks?: { readonly from: number; readonly to: number };
}

/**
 * A change to a plan. Each applies to every targeted line separately: "add 500 per week
 * to Video in Northland" adds 500 per week to each Northland cell's Video line.
 */
export type ScenarioOperation =
  | { readonly kind: "scale"; readonly target?: ScenarioTarget; readonly factor: number }
  | { readonly kind: "add"; readonly target?: ScenarioTarget; readonly amountPerWeek: number }
  | { readonly kind: "zero"; readonly target?: ScenarioTarget }
  /** Set the weekly spend: one value for every targeted week, or one value per targeted week. */
  | { readonly kind: "set"; readonly target?: ScenarioTarget; readonly weekly: number | readonly number[] };

/**
 * Applies operations in order to a copy of the plan and returns the new plan. The input
 * plan is never changed; any invalid operation, or a result below zero, throws before
 * anything is returned.
 */
export function applyScenario(plan: SpendPlan, operations: readonly ScenarioOperation[]): SpendPlan {
  if (!Array.isArray(operations)) throw new RangeError("operations must be a list");
  const C = plan.channels.length;
  const H = plan.horizon;
  if (plan.spend.length !== plan.cells.length * C * H) throw new RangeError(`the plan's spend has ${plan.spend.length} values; ${plan.cells.length} cells × ${C} channels × ${H} weeks expected`);
  const spend = Float64Array.from(plan.spend);
  operations.forEach((op, k) => {
    const what = `operation ${k + 1} (${String(op?.kind)})`;
    const mask = matchLines(op.target, plan.cells, plan.channels, what);
    const [from, to] = weekRange(op.target?.weeks, H, what);
    const span = to - from + 1;
    let apply: (x: number, h: number) => number;
    switch (op.kind) {
      case "scale":
        if (!(Number.isFinite(op.factor) && op.factor >= 0)) throw new RangeError(`${what}: the factor must be a number ≥ 0, got ${op.factor}`);
        apply = (x) => x * op.factor;
        break;
      case "add":
        if (!Number.isFinite(op.amountPerWeek)) throw new RangeError(`${what}: the amount per week must be a number, got ${op.amountPerWeek}`);
        apply = (x) => x + op.amountPerWeek;
        break;
      case "zero":
        apply = () => 0;
        break;
      case "set": {
        const weekly = op.weekly;
        if (typeof weekly === "number") {
          if (!(Number.isFinite(weekly) && weekly >= 0)) throw new RangeError(`${what}: the weekly spend must be a number ≥ 0, got ${weekly}`);
          apply = () => weekly;
        } else {
          if (!Array.isArray(weekly) || weekly.length !== span) {
            throw new RangeError(`${what}: give one weekly spend per targeted week (${span}), got ${Array.isArray(weekly) ? weekly.length : String(weekly)}`);
          }
          weekly.forEach((x, h) => {
            if (!(typeof x === "number" && Number.isFinite(x) && x >= 0)) throw new RangeError(`${what}: the weekly spend of targeted week ${h + 1} must be a number ≥ 0, got ${x}`);
          });
          apply = (_, h) => weekly[h - from]!;
        }
        break;
      }
      default:
        throw new RangeError(`${what}: unknown operation; use scale, add, zero or set`);
    }
    for (let i = 0; i < plan.cells.length; i++) {
      for (let c = 0; c < C; c++) {
        if (mask[i * C + c] === 0) continue;
        for (let h = from; h <= to; h++) {
          const at = planIndex(plan, i, c, h);
          const x = apply(spend[at]!, h);
          if (!(x >= 0)) {
            throw new RangeError(`${what} on ${describeTarget(op.target)} would make the spend of ${cellLabel(plan.cells[i]!)}, ${plan.channels[c]}, plan week ${h + 1} equal ${x}; spend cannot be negative`);
          }
          spend[at] = x;
        }
      }
    }
  });
  return { horizon: plan.horizon, channels: plan.channels, cells: plan.cells, spend };
}

function weekRange(weeks: ScenarioTarget["weeks"], horizon: number, what: string): [number, number] {
  if (weeks === undefined) return [0, horizon - 1];
  const { from, to } = weeks;
  if (!Number.isInteger(from) || !Number.isInteger(to) || from < 0 || to >= horizon || to < from) {
    throw new RangeError(`${what}: plan weeks must run within 0..${horizon - 1} (0 = the first plan week), got ${from}..${to}`);
  }
  return [from, to];
}
