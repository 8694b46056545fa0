// The budget split's inputs as typed, checked and turned into what the worker (stats
// package) and the API take, with a clear message for every field that is not valid.
import type { BudgetBoundView, BudgetSplitPlanInput, DecodedDrawSetCell, RiskAttitudeView } from "@tributary/contracts";

export type Objective = "customers" | "profit";
export type RiskKind = RiskAttitudeView["kind"];
export type BoundText = { lower: string; upper: string };

export type SplitFormState = {
  cellIds: string[];
  totalBudget: string;
  horizon: string;
  recentWeeks: string;
  /** Bounds over the horizon per channel, applied to each line (cell × channel) of that channel. */
  channelBounds: Record<string, BoundText>;
  /** Bounds over the horizon per cell, applied to each of the cell's lines. */
  cellBounds: Record<string, BoundText>;
  objective: Objective;
  risk: RiskKind;
  /** For "lower-quantile": the quantile in per cent (10 = the outcome reached in 90 % of draws). */
  quantilePercent: string;
  /** For "mean-minus-sd": the penalty on one standard deviation. */
  penalty: string;
};

/** The split's inputs for the stats package (cells by name) and for saving (cells by id). */
export type SplitInputs = Omit<BudgetSplitPlanInput, "name" | "note" | "runId" | "allocation"> & {
  cells: { brand: string; market: string }[];
  cellIds: string[];
  totalBudget: number;
  horizon: number;
  recentWeeks: number;
  bounds: BudgetBoundView[];
  risk: RiskAttitudeView;
};

export type SplitCheck = { ok: true; inputs: SplitInputs } | { ok: false; errors: Record<string, string> };

/** A number as typed: blank and text are not numbers; spaces and a comma as decimal mark are accepted. */
export function parseNumber(text: string): number | null {
  const cleaned = text.trim().replace(/\s/g, "").replace(",", ".");
  if (cleaned === "" || !/^[-+]?(\d+\.?\d*|\.\d+)(e[-+]?\d+)?$/i.test(cleaned)) return null;
  const value = Number(cleaned);
  return Number.isFinite(value) ? value : null;
}

/** Average weekly spend of a line over the last `recentWeeks` data weeks (all weeks when the cell is shorter). */
export function recentWeeklySpend(cell: Pick<DecodedDrawSetCell, "spend" | "weeks">, channelIndex: number, recentWeeks: number): number {
  const series = cell.spend[channelIndex];
  if (!series || cell.weeks === 0) return 0;
  const n = Math.min(recentWeeks, cell.weeks);
  let sum = 0;
  for (let t = cell.weeks - n; t < cell.weeks; t++) sum += series[t] ?? 0;
  return sum / n;
}

/** The current spend over the horizon of the chosen cells (what the budget is first set to). */
export function currentSpendOver(cells: readonly Pick<DecodedDrawSetCell, "spend" | "weeks">[], channels: number, horizon: number, recentWeeks: number): number {
  let total = 0;
  for (const cell of cells) for (let c = 0; c < channels; c++) total += recentWeeklySpend(cell, c, recentWeeks) * horizon;
  return total;
}

function wholeWeeks(text: string): number | null {
  const value = parseNumber(text);
  return value !== null && Number.isInteger(value) && value >= 1 && value <= 156 ? value : null;
}

function boundOf(text: BoundText | undefined, key: string, errors: Record<string, string>): { lower?: number; upper?: number } | null {
  if (!text) return null;
  const out: { lower?: number; upper?: number } = {};
  for (const side of ["lower", "upper"] as const) {
    if (text[side].trim() === "") continue;
    const value = parseNumber(text[side]);
    if (value === null || value < 0) errors[`${key}.${side}`] = `Enter ${side === "lower" ? "a lower" : "an upper"} bound of 0 or more, or leave it empty`;
    else out[side] = value;
  }
  if (out.lower !== undefined && out.upper !== undefined && out.lower > out.upper) errors[`${key}.upper`] = "The upper bound is below the lower bound";
  return out.lower === undefined && out.upper === undefined ? null : out;
}

/**
 * Checks the form against the draw set's cells and channels and the brands' customer
 * values (by brand name), and builds the inputs. Errors are keyed by field:
 * totalBudget, horizon, recentWeeks, cells, objective, quantilePercent, penalty,
 * channel:<name>.lower|upper, cell:<id>.lower|upper.
 */
export function checkSplitForm(state: SplitFormState, cells: readonly DecodedDrawSetCell[], channels: readonly string[], customerValues: Readonly<Record<string, number | null>>): SplitCheck {
  const errors: Record<string, string> = {};
  const chosen = cells.filter((cell) => state.cellIds.includes(cell.cellId));
  if (chosen.length === 0) errors.cells = "Choose at least one cell (brand × market)";
  const total = parseNumber(state.totalBudget);
  if (total === null || total <= 0) errors.totalBudget = "Enter a total budget above 0";
  const horizon = wholeWeeks(state.horizon);
  if (horizon === null) errors.horizon = "Enter a whole number of weeks from 1 to 156";
  const recentWeeks = wholeWeeks(state.recentWeeks);
  if (recentWeeks === null) errors.recentWeeks = "Enter a whole number of weeks from 1 to 156";

  const bounds: BudgetBoundView[] = [];
  for (const channel of channels) {
    const bound = boundOf(state.channelBounds[channel], `channel:${channel}`, errors);
    if (bound) bounds.push({ target: { channels: [channel] }, ...bound });
  }
  for (const cell of chosen) {
    const bound = boundOf(state.cellBounds[cell.cellId], `cell:${cell.cellId}`, errors);
    if (bound) bounds.push({ target: { cells: [{ brand: cell.brand, market: cell.market }] }, ...bound });
  }

  let objective: SplitInputs["objective"] = { kind: "customers" };
  if (state.objective === "profit") {
    const brands = [...new Set(chosen.map((cell) => cell.brand))];
    const missing = brands.filter((brand) => !(typeof customerValues[brand] === "number" && customerValues[brand]! > 0));
    if (missing.length > 0) errors.objective = `Profit needs the value of a new customer for ${missing.join(", ")}; an admin sets it in the portfolio settings`;
    else objective = { kind: "profit", customerValue: Object.fromEntries(brands.map((brand) => [brand, customerValues[brand]!])) };
  }

  let risk: RiskAttitudeView = { kind: "expected" };
  if (state.risk === "lower-quantile") {
    const percent = parseNumber(state.quantilePercent);
    if (percent === null || percent <= 0 || percent >= 50) errors.quantilePercent = "Enter a quantile above 0 and below 50 (per cent)";
    else risk = { kind: "lower-quantile", quantile: percent / 100 };
  } else if (state.risk === "mean-minus-sd") {
    const penalty = parseNumber(state.penalty);
    if (penalty === null || penalty < 0) errors.penalty = "Enter a penalty of 0 or more";
    else risk = { kind: "mean-minus-sd", penalty };
  }

  if (Object.keys(errors).length > 0) return { ok: false, errors };
  return {
    ok: true,
    inputs: {
      cells: chosen.map((cell) => ({ brand: cell.brand, market: cell.market })),
      cellIds: chosen.map((cell) => cell.cellId),
      totalBudget: total!,
      horizon: horizon!,
      recentWeeks: recentWeeks!,
      bounds,
      objective,
      risk,
    },
  };
}
