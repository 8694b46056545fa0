// A scenario as the editor holds it (text typed into fields) and its translation into the
// stats package's operations, with a clear message for every field that is not valid.
import type { ScenarioOperationView } from "@tributary/contracts";

/** An operation as both the API (mutable lists) and the stats package (read-only lists) take it. */
type ScenarioOperation = ScenarioOperationView;
type ScenarioTarget = NonNullable<ScenarioOperation["target"]>;

export type OperationKind = ScenarioOperation["kind"];

export const operationKindLabels: Record<OperationKind, string> = {
  scale: "Multiply spend by",
  add: "Add to weekly spend",
  zero: "Set spend to zero",
  set: "Set weekly spend to",
};

/** One change as typed. Empty channel, market or brand means "all"; weeks are 1-based and inclusive. */
export type OperationDraft = {
  id: string;
  kind: OperationKind;
  channel: string;
  market: string;
  brand: string;
  fromWeek: string;
  toWeek: string;
  /** Factor (scale), amount per week (add) or weekly spend (set, same every week). */
  value: string;
  /** For "set": one value per targeted week instead of one for all. */
  perWeek: boolean;
  weeklyValues: string[];
};

export type ScenarioDraft = { id: string; name: string; operations: OperationDraft[] };

export type DraftField = "value" | "fromWeek" | "toWeek" | `week-${number}`;
export type OperationCheck = { ok: true; operation: ScenarioOperation } | { ok: false; errors: Partial<Record<DraftField, string>> };

let counter = 0;
/** A short id for list keys, unique within the page. */
export function draftId(prefix: string): string {
  counter += 1;
  return `${prefix}-${counter}`;
}

export function newOperation(horizon: number, overrides: Partial<OperationDraft> = {}): OperationDraft {
  return { id: draftId("change"), kind: "scale", channel: "", market: "", brand: "", fromWeek: "1", toWeek: String(horizon), value: "1.2", perWeek: false, weeklyValues: [], ...overrides };
}

/** A number typed in a field: blank and text are not numbers; a comma as decimal mark is accepted. */
export function parseAmount(text: string): number | null {
  const cleaned = text.trim().replace(/\s/g, "").replace(",", ".");
  if (cleaned === "" || !/^[-+]?(\d+\.?\d*|\.\d+)(e[-+]?\d+)?$/i.test(cleaned)) return null;
  const value = Number(cleaned);
  return Number.isFinite(value) ? value : null;
}

function parseWeek(text: string): number | null {
  const value = parseAmount(text);
  return value !== null && Number.isInteger(value) ? value : null;
}

/** The weeks an operation covers, 1-based, or null while the range is not valid. */
export function weekSpan(draft: Pick<OperationDraft, "fromWeek" | "toWeek">, horizon: number): { from: number; to: number } | null {
  const from = parseWeek(draft.fromWeek);
  const to = parseWeek(draft.toWeek);
  if (from === null || to === null || from < 1 || to > horizon || to < from) return null;
  return { from, to };
}

/** Checks one change and turns it into a scenario operation. */
export function toOperation(draft: OperationDraft, horizon: number): OperationCheck {
  const errors: Partial<Record<DraftField, string>> = {};
  const from = parseWeek(draft.fromWeek);
  const to = parseWeek(draft.toWeek);
  if (from === null || from < 1 || from > horizon) errors.fromWeek = `Enter a week from 1 to ${horizon}`;
  if (to === null || to < 1 || to > horizon) errors.toWeek = `Enter a week from 1 to ${horizon}`;
  else if (from !== null && to < from) errors.toWeek = "The last week cannot come before the first";
  const value = parseAmount(draft.value);
  let weekly: number | number[] = 0;
  switch (draft.kind) {
    case "scale":
      if (value === null || value < 0) errors.value = "Enter a factor of 0 or more (1.2 = 20 % more)";
      break;
    case "add":
      if (value === null) errors.value = "Enter an amount per week (negative to cut)";
      break;
    case "set":
      if (draft.perWeek) {
        const span = from !== null && to !== null && to >= from ? to - from + 1 : 0;
        const values = Array.from({ length: span }, (_, k) => parseAmount(draft.weeklyValues[k] ?? ""));
        values.forEach((v, k) => {
          if (v === null || v < 0) errors[`week-${k}`] = `Enter the spend of week ${(from ?? 1) + k} (0 or more)`;
        });
        weekly = values.map((v) => v ?? 0);
      } else if (value === null || value < 0) errors.value = "Enter a weekly spend of 0 or more";
      else weekly = value;
      break;
    case "zero":
      break;
  }
  if (Object.keys(errors).length > 0) return { ok: false, errors };
  const target: ScenarioTarget = {};
  if (draft.channel) target.channels = [draft.channel];
  if (draft.market) target.markets = [draft.market];
  if (draft.brand) target.brands = [draft.brand];
  if (from! > 1 || to! < horizon) target.weeks = { from: from! - 1, to: to! - 1 };
  const withTarget = Object.keys(target).length > 0 ? { target } : {};
  switch (draft.kind) {
    case "scale":
      return { ok: true, operation: { kind: "scale", factor: value!, ...withTarget } };
    case "add":
      return { ok: true, operation: { kind: "add", amountPerWeek: value!, ...withTarget } };
    case "zero":
      return { ok: true, operation: { kind: "zero", ...withTarget } };
    case "set":
      return { ok: true, operation: { kind: "set", weekly, ...withTarget } };
  }
}

/** Every change of a scenario checked; the operations only when all are valid. */
export function toOperations(draft: ScenarioDraft, horizon: number): { operations: ScenarioOperation[] | null; checks: OperationCheck[] } {
  const checks = draft.operations.map((operation) => toOperation(operation, horizon));
  const operations = checks.every((check) => check.ok) ? checks.map((check) => (check as { operation: ScenarioOperation }).operation) : null;
  return { operations, checks };
}

/** A saved operation back as a draft for the editor (lists of one name each, as the editor makes them). */
export function fromOperation(operation: ScenarioOperation, horizon: number): OperationDraft {
  const target = operation.target ?? {};
  const weeks = target.weeks ?? { from: 0, to: horizon - 1 };
  const base = newOperation(horizon, {
    kind: operation.kind,
    channel: target.channels?.[0] ?? "",
    market: target.markets?.[0] ?? "",
    brand: target.brands?.[0] ?? "",
    fromWeek: String(weeks.from + 1),
    toWeek: String(weeks.to + 1),
  });
  switch (operation.kind) {
    case "scale":
      return { ...base, value: String(operation.factor) };
    case "add":
      return { ...base, value: String(operation.amountPerWeek) };
    case "zero":
      return { ...base, value: "" };
    case "set":
      return typeof operation.weekly === "number"
        ? { ...base, value: String(operation.weekly) }
        : { ...base, value: "", perWeek: true, weeklyValues: operation.weekly.map(String) };
  }
}

/** What a change does, in words: "Search in Ardeval, weeks 3–6: multiply spend by 1.2"; `channelName` turns codes into display names. */
export function describeOperation(operation: ScenarioOperation, horizon: number, channelName: (code: string) => string = (code) => code): string {
  const target = operation.target ?? {};
  const parts = [target.channels?.map(channelName).join(", ") ?? "every channel"];
  if (target.brands) parts.push(`of ${target.brands.join(", ")}`);
  if (target.markets) parts.push(`in ${target.markets.join(", ")}`);
  const weeks = target.weeks ?? { from: 0, to: horizon - 1 };
  const span = weeks.from === weeks.to ? `week ${weeks.from + 1}` : `weeks ${weeks.from + 1}–${weeks.to + 1}`;
  const what =
    operation.kind === "scale"
      ? `multiply spend by ${operation.factor}`
      : operation.kind === "add"
        ? `${operation.amountPerWeek < 0 ? "cut" : "add"} ${Math.abs(operation.amountPerWeek)} per week`
        : operation.kind === "zero"
          ? "no spend"
          : typeof operation.weekly === "number"
            ? `spend ${operation.weekly} per week`
            : `spend ${operation.weekly.join(", ")} in turn`;
  return `${parts.join(" ")}, ${span}: ${what}`;
}
