import { cellIndexOf, type DrawSet } from "../decisions/draw-set";
import { mondayOfAbsoluteWeek } from "../model/absolute-week";

/** A cell named by its brand and market, as the screens name it. */
export interface CellRef {
  readonly brand: string;
  readonly market: string;
}

/** A cell of a plan: its position in the run and the first week the plan covers. */
export interface PlanCell {
  /** Index of the cell in the run's draw set. */
  readonly cellIndex: number;
  readonly brand: string;
  readonly market: string;
  /** ISO Monday of the plan's first week: the week after the cell's last data week. */
  readonly firstWeek: string;
}

/** Longest plan horizon accepted (three years): trend and seasonality are not worth extrapolating further. */
export const MAX_PLAN_HORIZON = 156;

/** Default plan horizon and default window of the current plan, in weeks (a quarter). */
export const DEFAULT_PLAN_HORIZON = 13;
export const DEFAULT_RECENT_WEEKS = 13;

/** Checks a horizon in weeks, or throws a clear error. */
export function checkHorizon(horizon: number, what = "the plan horizon"): void {
  if (!Number.isInteger(horizon) || horizon < 1 || horizon > MAX_PLAN_HORIZON) {
    throw new RangeError(`${what} must be a whole number of weeks from 1 to ${MAX_PLAN_HORIZON}, got ${horizon}`);
  }
}

/** Indices of the chosen cells (all cells of the run when none are given), with clear errors for unknown or repeated cells. */
export function resolveCells(set: DrawSet, cells?: readonly CellRef[]): number[] {
  if (cells === undefined) return set.cells.map((_, g) => g);
  if (cells.length === 0) throw new RangeError("choose at least one cell (brand × market)");
  const seen = new Set<number>();
  return cells.map((ref) => {
    const g = cellIndexOf(set, ref.brand, ref.market);
    if (seen.has(g)) throw new RangeError(`cell ${ref.brand} × ${ref.market} is chosen twice`);
    seen.add(g);
    return g;
  });
}

/** The plan cells for cell indices of the run: each plan starts the week after the cell's last data week. */
export function planCellsOf(set: DrawSet, indices: readonly number[]): PlanCell[] {
  return indices.map((g) => {
    const cell = set.cells[g]!;
    return { cellIndex: g, brand: cell.brand, market: cell.market, firstWeek: mondayOfAbsoluteWeek(cell.firstAbsoluteWeek + cell.weeks) };
  });
}

/** "Brand × Market" for messages. */
export function cellLabel(cell: CellRef): string {
  return `${cell.brand} × ${cell.market}`;
}
