import {
  dayNumberToIsoDate,
  isoDateToDayNumber,
  liftTestInputSchema,
  sanitiseChannelName,
  weekdayNames,
  weekdayOfDayNumber,
  type IntakeIssueCode,
  type LiftTestInput,
  type ValidationReport,
} from "@tributary/contracts";
import type { CellSeries, PortfolioData } from "@tributary/stats";
import { parseCsvText, type CsvTextOptions } from "./csv-text";
import { displayName, nameKey, nameProblem } from "./entity-names";
import { IssueList } from "./issue-list";
import { formatNumber, listWords, quoteValue } from "./message-text";
import { MAX_MAGNITUDE, readNumber } from "./numeric-value";

/** A lift test checked against a dataset: brand, market and channel spelled as the data spell them. */
export type LiftTest = LiftTestInput;

export type LiftTestResult =
  | { readonly ok: true; readonly test: LiftTest; readonly report: ValidationReport }
  | { readonly ok: false; readonly report: ValidationReport };

export type LiftTestsCsvResult =
  | { readonly ok: true; readonly tests: readonly LiftTest[]; readonly report: ValidationReport }
  | { readonly ok: false; readonly report: ValidationReport };

type LiftField = "brand" | "market" | "channel" | "firstWeek" | "lastWeek" | "spend" | "incrementalOutcome" | "standardError" | "note";

const FIELD_LABELS: Record<LiftField, string> = {
  brand: "the brand",
  market: "the market",
  channel: "the channel",
  firstWeek: "the first week",
  lastWeek: "the last week",
  spend: "the spend",
  incrementalOutcome: "the incremental outcome",
  standardError: "the standard error",
  note: "the note",
};

/** CSV column names of a lift-tests file, with the other spellings accepted (case-insensitive). */
export const LIFT_TEST_COLUMNS: Record<LiftField, readonly string[]> = {
  brand: ["brand"],
  market: ["market"],
  channel: ["channel"],
  firstWeek: ["first_week", "start_week", "from_week"],
  lastWeek: ["last_week", "end_week", "to_week"],
  spend: ["spend", "test_spend"],
  incrementalOutcome: ["incremental_outcome", "incremental", "lift"],
  standardError: ["standard_error", "se", "std_error"],
  note: ["note", "notes"],
};
const REQUIRED_FIELDS: readonly LiftField[] = ["brand", "market", "channel", "firstWeek", "lastWeek", "spend", "incrementalOutcome", "standardError"];

interface CheckContext {
  readonly issues: IssueList;
  /** Spreadsheet row of the test, or null for a single entered test. */
  readonly row: number | null;
  /** The column or field name to report for each field. */
  readonly columns: Record<LiftField, string>;
}

const FIELD_NAMES: Record<LiftField, string> = {
  brand: "brand",
  market: "market",
  channel: "channel",
  firstWeek: "firstWeek",
  lastWeek: "lastWeek",
  spend: "spend",
  incrementalOutcome: "incrementalOutcome",
  standardError: "standardError",
  note: "note",
};

function sentence(ctx: CheckContext, text: string): string {
  const body = text.charAt(0).toUpperCase() + text.slice(1);
  return ctx.row === null ? body : `Row ${ctx.row}: ${text}`;
}

function report(ctx: CheckContext, code: IntakeIssueCode, field: LiftField | null, text: string, severity: "error" | "warning" = "error"): void {
  const column = field === null ? null : ctx.columns[field];
  if (severity === "error") ctx.issues.error(code, ctx.row, column, sentence(ctx, text));
  else ctx.issues.warning(code, ctx.row, column, sentence(ctx, text));
}

function readText(value: unknown, field: LiftField, ctx: CheckContext): string | null {
  if (value === undefined || value === null || (typeof value === "string" && value.trim() === "")) {
    report(ctx, "value_missing", field, `${FIELD_LABELS[field]} is missing.`);
    return null;
  }
  if (typeof value !== "string") {
    report(ctx, "mapping_invalid", field, `${FIELD_LABELS[field]} must be text.`);
    return null;
  }
  return value;
}

function readWeek(value: unknown, field: LiftField, ctx: CheckContext): number | null {
  const text = readText(value, field, ctx);
  if (text === null) return null;
  const trimmed = text.trim();
  const day = isoDateToDayNumber(trimmed);
  if (day === null) {
    report(ctx, "date_invalid", field, `${FIELD_LABELS[field]} ${quoteValue(trimmed)} is not a date in the form YYYY-MM-DD, e.g. 2024-01-01.`);
    return null;
  }
  const weekday = weekdayOfDayNumber(day);
  if (weekday !== 0) {
    report(
      ctx,
      "date_not_monday",
      field,
      `${FIELD_LABELS[field]} ${trimmed} is a ${weekdayNames[weekday]}; weeks are named by their Monday (the Monday of that week is ${dayNumberToIsoDate(day - weekday)}).`,
    );
    return null;
  }
  return day;
}

function readAmount(value: unknown, field: LiftField, ctx: CheckContext): number | null {
  if (value === undefined || value === null || (typeof value === "string" && value.trim() === "")) {
    report(ctx, "value_missing", field, `${FIELD_LABELS[field]} is missing.`);
    return null;
  }
  let number: number;
  if (typeof value === "number") number = value;
  else if (typeof value === "string") {
    const reading = readNumber(value);
    switch (reading.kind) {
      case "number":
        number = reading.value;
        break;
      case "too_large":
        number = reading.value;
        break;
      case "formula":
        report(ctx, "formula", field, `${FIELD_LABELS[field]} ${quoteValue(value.trim())} looks like a spreadsheet formula, not a number.`);
        return null;
      case "not_finite":
        report(ctx, "not_finite", field, `${FIELD_LABELS[field]} ${quoteValue(value.trim())} is not a finite number.`);
        return null;
      case "not_a_number":
        report(ctx, "not_a_number", field, `${FIELD_LABELS[field]} ${quoteValue(value.trim())} is not a number; ${reading.hint}.`);
        return null;
      case "missing":
        report(ctx, "value_missing", field, `${FIELD_LABELS[field]} is missing.`);
        return null;
    }
  } else {
    report(ctx, "not_a_number", field, `${FIELD_LABELS[field]} must be a number.`);
    return null;
  }
  if (!Number.isFinite(number)) {
    report(ctx, "not_finite", field, `${FIELD_LABELS[field]} is not a finite number.`);
    return null;
  }
  if (Math.abs(number) > MAX_MAGNITUDE) {
    report(ctx, "number_too_large", field, `${FIELD_LABELS[field]} ${formatNumber(number)} is beyond the largest accepted magnitude (${formatNumber(MAX_MAGNITUDE)}).`);
    return null;
  }
  return number === 0 ? 0 : number;
}

function readName(value: unknown, field: "brand" | "market", ctx: CheckContext): string | null {
  const text = readText(value, field, ctx);
  if (text === null) return null;
  const name = displayName(text);
  const problem = nameProblem(name);
  if (problem !== null) {
    report(ctx, "name_invalid", field, `${FIELD_LABELS[field]} ${quoteValue(name)} ${problem}.`);
    return null;
  }
  return name;
}

function cellLastDay(cell: CellSeries): number | null {
  const first = isoDateToDayNumber(cell.firstWeek);
  return first === null ? null : first + 7 * (cell.outcome.length - 1);
}

function checkLiftTest(input: unknown, data: PortfolioData, ctx: CheckContext): LiftTest | null {
  if (typeof input !== "object" || input === null || Array.isArray(input)) {
    report(ctx, "mapping_invalid", null, "a lift test must give brand, market, channel, first and last week, spend, incremental outcome and standard error.");
    return null;
  }
  const fields = input as Record<string, unknown>;
  const errorsBefore = ctx.issues.errorCount;
  const brand = readName(fields.brand, "brand", ctx);
  const market = readName(fields.market, "market", ctx);
  const channelText = readText(fields.channel, "channel", ctx);
  const firstDay = readWeek(fields.firstWeek, "firstWeek", ctx);
  const lastDay = readWeek(fields.lastWeek, "lastWeek", ctx);
  const spend = readAmount(fields.spend, "spend", ctx);
  const incrementalOutcome = readAmount(fields.incrementalOutcome, "incrementalOutcome", ctx);
  const standardError = readAmount(fields.standardError, "standardError", ctx);
  let note: string | undefined;
  if (fields.note !== undefined && fields.note !== null && fields.note !== "") {
    if (typeof fields.note !== "string" || fields.note.trim().length > 500) {
      report(ctx, "mapping_invalid", "note", "the note must be text of at most 500 characters.");
    } else if (fields.note.trim() !== "") note = fields.note.trim();
  }
  if (spend !== null && spend < 0) report(ctx, "negative_spend", "spend", `the spend is ${formatNumber(spend)}; it cannot be negative.`);
  if (standardError !== null && standardError <= 0) {
    report(ctx, "standard_error_invalid", "standardError", `the standard error is ${formatNumber(standardError)}; it must be greater than 0.`);
  }
  if (firstDay !== null && lastDay !== null && firstDay > lastDay) {
    report(ctx, "window_order", "lastWeek", `the first week (${dayNumberToIsoDate(firstDay)}) is after the last week (${dayNumberToIsoDate(lastDay)}).`);
  }

  let channel: string | null = null;
  if (channelText !== null) {
    const wanted = sanitiseChannelName(channelText);
    if (data.channels.includes(wanted)) channel = wanted;
    else report(ctx, "channel_unknown", "channel", `the dataset has no channel ${quoteValue(channelText.trim())}; its channels are ${listWords(data.channels.map((c) => `"${c}"`))}.`);
  }
  let cell: CellSeries | undefined;
  if (brand !== null && market !== null) {
    cell = data.cells.find((c) => nameKey(c.brand) === nameKey(brand) && nameKey(c.market) === nameKey(market));
    if (cell === undefined) {
      const known = data.cells.slice(0, 12).map((c) => `${c.brand} × ${c.market}`);
      const more = data.cells.length > known.length ? ", …" : "";
      report(ctx, "cell_unknown", "brand", `the dataset has no cell ${brand} × ${market}${known.length > 0 ? ` (it has ${known.join(", ")}${more})` : ""}.`);
    }
  }
  if (cell !== undefined && firstDay !== null && lastDay !== null && firstDay <= lastDay) {
    const dataFirst = isoDateToDayNumber(cell.firstWeek);
    const dataLast = cellLastDay(cell);
    if (dataFirst !== null && dataLast !== null) {
      if (firstDay < dataFirst || lastDay > dataLast) {
        report(
          ctx,
          "window_outside_data",
          firstDay < dataFirst ? "firstWeek" : "lastWeek",
          `the test weeks ${dayNumberToIsoDate(firstDay)} to ${dayNumberToIsoDate(lastDay)} are not all inside the weeks ${cell.brand} × ${cell.market} has data for (${cell.firstWeek} to ${dayNumberToIsoDate(dataLast)}).`,
        );
      } else if (channel !== null) {
        const spendSeries = cell.spend[data.channels.indexOf(channel)];
        if (spendSeries !== undefined) {
          let windowSpend = 0;
          for (let day = firstDay; day <= lastDay; day += 7) windowSpend += spendSeries[(day - dataFirst) / 7] ?? 0;
          if (windowSpend === 0) {
            report(ctx, "lift_no_spend_in_data", "channel", `the data show no spend on ${channel} in ${cell.brand} × ${cell.market} during the test weeks; check the weeks and the channel.`, "warning");
          }
        }
      }
    }
  }
  if (ctx.issues.errorCount > errorsBefore || cell === undefined || channel === null) return null;
  const test = {
    brand: cell.brand,
    market: cell.market,
    channel,
    firstWeek: dayNumberToIsoDate(firstDay as number),
    lastWeek: dayNumberToIsoDate(lastDay as number),
    spend: spend as number,
    incrementalOutcome: incrementalOutcome as number,
    standardError: standardError as number,
    ...(note === undefined ? {} : { note }),
  };
  // The shared schema is what the web form and the API use; a test passing here must pass it too.
  const shaped = liftTestInputSchema.safeParse(test);
  if (!shaped.success) {
    for (const issue of shaped.error.issues) report(ctx, "mapping_invalid", null, issue.message);
    return null;
  }
  return shaped.data;
}

/**
 * Checks one lift test (as entered in a form or sent to the API) against a dataset: the
 * cell and channel exist, the weeks are Mondays inside the cell's data with the first not
 * after the last, spend ≥ 0, standard error > 0, all numbers finite. Never throws.
 */
export function validateLiftTest(input: unknown, data: PortfolioData): LiftTestResult {
  const issues = new IssueList();
  const test = checkLiftTest(input, data, { issues, row: null, columns: FIELD_NAMES });
  const result = issues.report(null);
  return test === null ? { ok: false, report: result } : { ok: true, test, report: result };
}

/**
 * Reads a CSV of lift tests (columns brand, market, channel, first_week, last_week,
 * spend, incremental_outcome, standard_error, optional note; case-insensitive) and checks
 * each against the dataset. Returns the tests only when no row has an error.
 */
export function parseLiftTestsCsv(text: string, data: PortfolioData, options: CsvTextOptions = {}): LiftTestsCsvResult {
  const csv = parseCsvText(text, options);
  if (!csv.ok) return { ok: false, report: csv.report };
  const issues = new IssueList(options);
  const columnIndex = new Map<LiftField, number>();
  const columns = { ...FIELD_NAMES };
  const simple = csv.header.map((name) => name.trim().toLowerCase().replace(/[\s\-]+/g, "_"));
  const used = new Set<number>();
  for (const field of Object.keys(LIFT_TEST_COLUMNS) as LiftField[]) {
    const index = simple.findIndex((name, i) => !used.has(i) && LIFT_TEST_COLUMNS[field].includes(name));
    if (index >= 0) {
      columnIndex.set(field, index);
      columns[field] = csv.header[index] ?? field;
      used.add(index);
    }
  }
  const missing = REQUIRED_FIELDS.filter((field) => !columnIndex.has(field));
  if (missing.length > 0) {
    issues.error(
      "mapping_incomplete",
      1,
      null,
      `The lift-tests file has no column for ${listWords(missing.map((field) => `"${LIFT_TEST_COLUMNS[field][0]}"`))}. Its columns must be ${listWords(REQUIRED_FIELDS.map((field) => `"${LIFT_TEST_COLUMNS[field][0]}"`))}, and optionally "note".`,
    );
    return { ok: false, report: issues.report(null) };
  }
  const ignored = csv.header.filter((_, i) => !used.has(i));
  if (ignored.length > 0) issues.warning("column_ignored", 1, null, `Not used: ${ignored.map((c) => `"${c}"`).join(", ")}.`);

  const tests: LiftTest[] = [];
  const seen = new Map<string, number>();
  csv.rows.forEach((row, i) => {
    const rowNumber = csv.rowNumbers[i] ?? i + 2;
    const input: Record<string, string> = {};
    for (const [field, index] of columnIndex) input[field] = row[index] ?? "";
    const test = checkLiftTest(input, data, { issues, row: rowNumber, columns });
    if (test === null) return;
    const key = [test.brand, test.market, test.channel, test.firstWeek, test.lastWeek].join("\u0000");
    const earlier = seen.get(key);
    if (earlier !== undefined) {
      issues.error("duplicate_row", rowNumber, null, `Row ${rowNumber} repeats the lift test of row ${earlier} (same cell, channel and weeks).`);
      return;
    }
    seen.set(key, rowNumber);
    tests.push(test);
  });
  const result = issues.report(null);
  return result.ok ? { ok: true, tests, report: result } : { ok: false, report: result };
}
