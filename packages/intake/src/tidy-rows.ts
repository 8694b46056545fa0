import {
  dayNumberToIsoDate,
  isoDateToDayNumber,
  weekdayNames,
  weekdayOfDayNumber,
  type CellSummary,
  type ColumnMapping,
  type DatasetSummary,
  type ValidationReport,
} from "@tributary/contracts";
import { validateMapping } from "./column-mapping";
import { compareNames, displayName, nameKey, nameProblem } from "./entity-names";
import { IssueList, type IssueLimits } from "./issue-list";
import { formatNumber, listWords, plural, quoteValue } from "./message-text";
import { MAX_MAGNITUDE, readNumber } from "./numeric-value";
import { median, robustScale } from "./robust-spread";

export interface TidyValidationOptions extends IssueLimits {
  /** Spreadsheet row number of each row (from parseCsvText); default: index + 2. */
  readonly rowNumbers?: readonly number[];
  /** A cell with fewer weeks is an error (default 8). */
  readonly minWeeks?: number;
  /** A cell with fewer weeks gets a warning (default 26). */
  readonly shortCellWeeks?: number;
  /** Robust z-score above which a week is called a spike (default 6). */
  readonly spikeZ?: number;
  /** First or last week below this share of the cell's median outcome looks partial (default 0.5). */
  readonly partialWeekRatio?: number;
  /** Largest accepted magnitude of any number (default 1e12). */
  readonly maxMagnitude?: number;
}

/** One usable row of a cell, its numbers NaN where the value was not valid. */
export interface TidyRow {
  readonly rowNumber: number;
  /** Day number of the week's Monday. */
  readonly day: number;
  /** True when every value of the row is valid. */
  readonly valid: boolean;
  readonly outcome: number;
  readonly spend: Float64Array;
  readonly controls: Float64Array;
}

/** The rows of one brand × market cell, sorted by week. */
export interface TidyCell {
  readonly brand: string;
  readonly market: string;
  readonly rows: readonly TidyRow[];
}

export interface TidyAnalysis {
  readonly report: ValidationReport;
  /** The validated mapping (channel names sanitised), or null when the mapping was invalid. */
  readonly mapping: ColumnMapping | null;
  /** Cells sorted by brand then market; empty when the mapping was invalid. */
  readonly cells: readonly TidyCell[];
}

interface MutableRow {
  rowNumber: number;
  day: number;
  exactMonday: boolean;
  valid: boolean;
  outcome: number;
  spend: Float64Array;
  controls: Float64Array;
}

interface CellBuilder {
  brandKey: string;
  marketKey: string;
  byDay: Map<number, MutableRow>;
  rowCount: number;
}

interface Spellings {
  /** display spelling → [count, first row] */
  readonly forms: Map<string, [number, number]>;
}

const DEFAULTS = { minWeeks: 8, shortCellWeeks: 26, spikeZ: 6, partialWeekRatio: 0.5 };
const MAX_LISTED_GAPS = 10;

function dateHint(value: string): string {
  if (/^\d{4}-\d{2}-\d{2}$/.test(value)) return "is not a real calendar date (or lies outside 1900–2100)";
  if (/^\d{4}-\d{2}-\d{2}[T ]/.test(value)) return "has a time in it; give the date only, as YYYY-MM-DD";
  if (/^\d{1,2}[./-]\d{1,2}[./-]\d{2,4}$/.test(value)) return "is not in the form YYYY-MM-DD; write dates as e.g. 2024-01-01 (day-first and month-first dates are ambiguous)";
  return "is not a date in the form YYYY-MM-DD, e.g. 2024-01-01";
}

function weekRuns(missing: readonly number[]): string[] {
  const runs: string[] = [];
  let start = 0;
  for (let i = 1; i <= missing.length; i++) {
    const prev = missing[i - 1] as number;
    if (i < missing.length && (missing[i] as number) === prev + 7) continue;
    const first = missing[start] as number;
    const count = i - start;
    runs.push(count === 1 ? dayNumberToIsoDate(first) : `${dayNumberToIsoDate(first)} to ${dayNumberToIsoDate(prev)} (${count} weeks)`);
    start = i;
  }
  return runs;
}

/**
 * Validates tidy rows (one per week × brand × market) against a column mapping and
 * returns the report together with the rows grouped into cells. Never throws.
 */
export function analyseTidyRows(
  header: readonly string[],
  rows: readonly (readonly string[])[],
  mappingInput: unknown,
  options: TidyValidationOptions = {},
): TidyAnalysis {
  const mappingResult = validateMapping(mappingInput, header);
  if (!mappingResult.ok) return { report: mappingResult.report, mapping: null, cells: [] };
  const mapping = mappingResult.mapping;
  const issues = new IssueList(options);
  const minWeeks = options.minWeeks ?? DEFAULTS.minWeeks;
  const shortCellWeeks = options.shortCellWeeks ?? DEFAULTS.shortCellWeeks;
  const spikeZ = options.spikeZ ?? DEFAULTS.spikeZ;
  const partialRatio = options.partialWeekRatio ?? DEFAULTS.partialWeekRatio;
  const maxMagnitude = options.maxMagnitude ?? MAX_MAGNITUDE;

  const indexOf = new Map(header.map((name, i) => [name, i] as const));
  const at = (name: string) => indexOf.get(name) as number;
  const weekIndex = at(mapping.week);
  const brandIndex = at(mapping.brand);
  const marketIndex = at(mapping.market);
  const outcomeIndex = at(mapping.outcome);
  const channelIndices = mapping.channels.map((c) => at(c.column));
  const controlIndices = mapping.controls.map(at);
  const channelNames = mapping.channels.map((c) => c.channel);
  const C = channelIndices.length;
  const K = controlIndices.length;

  const cells = new Map<string, CellBuilder>();
  const brandSpellings = new Map<string, Spellings>();
  const marketSpellings = new Map<string, Spellings>();
  let outcomeTotal = 0;
  /** Rows whose week, brand or market could not be read, so they belong to no cell. */
  let unplacedRows = 0;
  const spendTotals = new Float64Array(C);

  /** Reads a numeric cell, reporting any problem; NaN when unusable. */
  const numberAt = (row: readonly string[], index: number, rowNumber: number, column: string, role: "outcome" | "spend" | "control"): number => {
    const raw = row[index] ?? "";
    const reading = readNumber(raw, maxMagnitude);
    switch (reading.kind) {
      case "number":
        if (reading.value < 0 && role === "spend") {
          issues.error("negative_spend", rowNumber, column, `Row ${rowNumber}: spend in "${column}" is ${formatNumber(reading.value)}; spend cannot be negative.`);
          return Number.NaN;
        }
        if (reading.value < 0 && role === "outcome") {
          issues.error("negative_outcome", rowNumber, column, `Row ${rowNumber}: the outcome "${column}" is ${formatNumber(reading.value)}; it cannot be negative.`);
          return Number.NaN;
        }
        return reading.value;
      case "missing":
        issues.error(
          "value_missing",
          rowNumber,
          column,
          `Row ${rowNumber}: "${column}" is empty.${role === "spend" ? " Enter 0 for a week without spend." : ""}`,
        );
        return Number.NaN;
      case "formula":
        issues.error("formula", rowNumber, column, `Row ${rowNumber}: "${column}" holds ${quoteValue(raw.trim())}, which looks like a spreadsheet formula, not a number. Paste the values instead.`);
        return Number.NaN;
      case "not_finite":
        issues.error("not_finite", rowNumber, column, `Row ${rowNumber}: "${column}" holds ${quoteValue(raw.trim())}, which is not a finite number.`);
        return Number.NaN;
      case "too_large":
        issues.error(
          "number_too_large",
          rowNumber,
          column,
          `Row ${rowNumber}: "${column}" is ${formatNumber(reading.value)}, beyond the largest accepted magnitude (${formatNumber(maxMagnitude)}); check for a typo.`,
        );
        return Number.NaN;
      case "not_a_number":
        issues.error("not_a_number", rowNumber, column, `Row ${rowNumber}: "${column}" holds ${quoteValue(raw.trim())}, which is not a number; ${reading.hint}.`);
        return Number.NaN;
    }
  };

  const nameAt = (row: readonly string[], index: number, rowNumber: number, column: string, what: "brand" | "market", spellings: Map<string, Spellings>): string | null => {
    const name = displayName(row[index] ?? "");
    if (name === "") {
      issues.error("value_missing", rowNumber, column, `Row ${rowNumber}: the ${what} is empty.`);
      return null;
    }
    const problem = nameProblem(name);
    if (problem !== null) {
      issues.error("name_invalid", rowNumber, column, `Row ${rowNumber}: the ${what} ${quoteValue(name)} ${problem}.`);
      return null;
    }
    const key = nameKey(name);
    let entry = spellings.get(key);
    if (!entry) {
      entry = { forms: new Map() };
      spellings.set(key, entry);
    }
    const form = entry.forms.get(name);
    if (form) form[0] += 1;
    else entry.forms.set(name, [1, rowNumber]);
    return key;
  };

  // Weeks repeat across cells: parse each distinct date text once.
  const dayCache = new Map<string, number | null>();
  const dayOf = (text: string): number | null => {
    let day = dayCache.get(text);
    if (day === undefined) {
      day = isoDateToDayNumber(text);
      dayCache.set(text, day);
    }
    return day;
  };

  // When every date falls on the same other weekday, say so once, before the row-by-row list.
  const weekdayCounts = new Int32Array(7);
  for (const row of rows) {
    const parsedDay = dayOf((row[weekIndex] ?? "").trim());
    if (parsedDay === null) continue;
    const weekday = weekdayOfDayNumber(parsedDay);
    weekdayCounts[weekday] = (weekdayCounts[weekday] ?? 0) + 1;
  }
  const parsedDates = weekdayCounts.reduce((a, b) => a + b, 0);
  for (let weekday = 1; weekday < 7; weekday++) {
    if (parsedDates > 1 && weekdayCounts[weekday] === parsedDates) {
      issues.error(
        "date_not_monday",
        null,
        mapping.week,
        `Every date in "${mapping.week}" is a ${weekdayNames[weekday]}. Tributary names each week by its Monday: shift the dates to the Monday that starts each week.`,
      );
    }
  }

  for (let i = 0; i < rows.length; i++) {
    const row = rows[i] ?? [];
    const rowNumber = options.rowNumbers?.[i] ?? i + 2;
    if (row.length !== header.length) {
      issues.error("column_count", rowNumber, null, `Row ${rowNumber} has ${plural(row.length, "value")} but the header has ${plural(header.length, "column")}.`);
      continue;
    }
    let keyOk = true;
    let day = 0;
    let exactMonday = true;
    const weekRaw = (row[weekIndex] ?? "").trim();
    if (weekRaw === "") {
      issues.error("value_missing", rowNumber, mapping.week, `Row ${rowNumber}: the week is empty.`);
      keyOk = false;
    } else {
      const parsedDay = dayOf(weekRaw);
      if (parsedDay === null) {
        issues.error("date_invalid", rowNumber, mapping.week, `Row ${rowNumber}: the week ${quoteValue(weekRaw)} ${dateHint(weekRaw)}.`);
        keyOk = false;
      } else {
        const weekday = weekdayOfDayNumber(parsedDay);
        // A stray non-Monday is still placed in its ISO week so it does not also show up as a gap.
        day = parsedDay - weekday;
        if (weekday !== 0) {
          exactMonday = false;
          issues.error(
            "date_not_monday",
            rowNumber,
            mapping.week,
            `Row ${rowNumber}: the week ${weekRaw} is a ${weekdayNames[weekday]}; weeks are named by their Monday (the Monday of that week is ${dayNumberToIsoDate(day)}).`,
          );
        }
      }
    }
    const brandKey = nameAt(row, brandIndex, rowNumber, mapping.brand, "brand", brandSpellings);
    const marketKey = nameAt(row, marketIndex, rowNumber, mapping.market, "market", marketSpellings);

    const outcome = numberAt(row, outcomeIndex, rowNumber, mapping.outcome, "outcome");
    let valuesOk = !Number.isNaN(outcome);
    if (valuesOk) outcomeTotal += outcome;
    const spend = new Float64Array(C);
    for (let c = 0; c < C; c++) {
      const value = numberAt(row, channelIndices[c] as number, rowNumber, mapping.channels[c]?.column ?? "", "spend");
      spend[c] = value;
      if (Number.isNaN(value)) valuesOk = false;
      else spendTotals[c] = (spendTotals[c] as number) + value;
    }
    const controls = new Float64Array(K);
    for (let k = 0; k < K; k++) {
      const value = numberAt(row, controlIndices[k] as number, rowNumber, mapping.controls[k] ?? "", "control");
      controls[k] = value;
      if (Number.isNaN(value)) valuesOk = false;
    }

    if (!keyOk || brandKey === null || marketKey === null) {
      unplacedRows++;
      continue;
    }
    const cellKey = `${brandKey}\u0000${marketKey}`;
    let cell = cells.get(cellKey);
    if (!cell) {
      cell = { brandKey, marketKey, byDay: new Map(), rowCount: 0 };
      cells.set(cellKey, cell);
    }
    cell.rowCount++;
    const record: MutableRow = { rowNumber, day, exactMonday, valid: valuesOk && exactMonday, outcome, spend, controls };
    const earlier = cell.byDay.get(day);
    if (earlier === undefined) cell.byDay.set(day, record);
    else if (exactMonday && earlier.exactMonday) {
      issues.error(
        "duplicate_row",
        rowNumber,
        mapping.week,
        `Row ${rowNumber} repeats week ${dayNumberToIsoDate(day)} for ${displayName(row[brandIndex] ?? "")} × ${displayName(row[marketIndex] ?? "")} (first given in row ${earlier.rowNumber}).`,
      );
    } else if (exactMonday) cell.byDay.set(day, record);
  }

  // Names as shown: the most used spelling of each (the first seen on a tie).
  const chooseSpelling = (spellings: Map<string, Spellings>, what: "brand" | "market"): Map<string, string> => {
    const chosen = new Map<string, string>();
    for (const [key, { forms }] of spellings) {
      let best = "";
      let bestCount = -1;
      let bestRow = Infinity;
      for (const [form, [count, firstRow]] of forms) {
        if (count > bestCount || (count === bestCount && firstRow < bestRow)) {
          best = form;
          bestCount = count;
          bestRow = firstRow;
        }
      }
      chosen.set(key, best);
      if (forms.size > 1) {
        const described = [...forms].map(([form, [count, firstRow]]) => `${quoteValue(form)} (${plural(count, "row")}, first in row ${firstRow})`);
        const firstOther = Math.min(...[...forms].filter(([form]) => form !== best).map(([, [, firstRow]]) => firstRow));
        issues.warning(
          "name_variants",
          firstOther,
          what === "brand" ? mapping.brand : mapping.market,
          `The ${what} is written ${plural(forms.size, "way")}: ${listWords(described)}. They are read as one ${what}, ${quoteValue(best)}.`,
        );
      }
    }
    return chosen;
  };
  const brandNames = chooseSpelling(brandSpellings, "brand");
  const marketNames = chooseSpelling(marketSpellings, "market");

  const unplacedNote =
    unplacedRows > 0
      ? ` (${plural(unplacedRows, "row")} could not be placed in a cell because of the week, brand or market errors above; fixing them may settle this)`
      : "";
  const builtCells: TidyCell[] = [];
  const cellSummaries: CellSummary[] = [];
  const sortedCells = [...cells.values()]
    .map((cell) => ({ cell, brand: brandNames.get(cell.brandKey) ?? cell.brandKey, market: marketNames.get(cell.marketKey) ?? cell.marketKey }))
    .sort((a, b) => compareNames(a.brand, b.brand) || compareNames(a.market, b.market));
  const channelHasSpendSomewhere = new Array<boolean>(C).fill(false);
  const zeroSpendCells: { label: string; channel: number }[] = [];

  for (const { cell, brand, market } of sortedCells) {
    const label = `${brand} × ${market}`;
    const cellRows = [...cell.byDay.values()].sort((a, b) => a.day - b.day);
    const first = cellRows[0] as MutableRow;
    const last = cellRows[cellRows.length - 1] as MutableRow;
    cellSummaries.push({
      brand,
      market,
      firstWeek: dayNumberToIsoDate(first.day),
      lastWeek: dayNumberToIsoDate(last.day),
      weeks: cellRows.length,
      rows: cell.rowCount,
    });
    builtCells.push({ brand, market, rows: cellRows });

    // Gaps: every week from the cell's first to its last must have a row.
    const missing: number[] = [];
    let rowAfterFirstGap: number | null = null;
    for (let i = 1; i < cellRows.length; i++) {
      const prev = (cellRows[i - 1] as MutableRow).day;
      const next = cellRows[i] as MutableRow;
      if (next.day - prev > 7) {
        rowAfterFirstGap ??= next.rowNumber;
        for (let d = prev + 7; d < next.day && missing.length <= 100_000; d += 7) missing.push(d);
      }
    }
    if (missing.length > 0) {
      const runs = weekRuns(missing);
      const listed = runs.slice(0, MAX_LISTED_GAPS);
      const more = runs.length > MAX_LISTED_GAPS ? ` and ${plural(runs.length - MAX_LISTED_GAPS, "more gap")}` : "";
      issues.error(
        "week_gap",
        rowAfterFirstGap,
        mapping.week,
        `${label} has no rows for ${plural(missing.length, "week")} between its first and last week: ${listWords(listed)}${more}. Every week from a cell's first to its last needs a row (enter 0 for weeks without spend)${unplacedNote}.`,
      );
    }

    if (cellRows.length < minWeeks) {
      issues.error("cell_too_short", null, null, `${label} has only ${plural(cellRows.length, "week")} of data; at least ${minWeeks} are needed to fit a cell${unplacedNote}.`);
    } else if (cellRows.length < shortCellWeeks) {
      issues.warning(
        "cell_short",
        null,
        null,
        `${label} has ${plural(cellRows.length, "week")} of data (fewer than ${shortCellWeeks}); its estimates will lean heavily on the portfolio.`,
      );
    }

    const validRows = cellRows.filter((r) => r.valid);
    if (validRows.length === 0) continue;
    const outcomes = Float64Array.from(validRows, (r) => r.outcome);
    if (outcomes.every((y) => y === 0)) {
      issues.warning("outcome_all_zero", null, mapping.outcome, `${label} has an outcome of 0 in every week; the model cannot learn anything from it.`);
    }

    const flagged = new Set<number>();
    if (validRows.length >= minWeeks) {
      const outcomeMedian = median(outcomes);
      const firstValid = validRows[0] as MutableRow;
      const lastValid = validRows[validRows.length - 1] as MutableRow;
      for (const [edge, which] of [
        [firstValid, "first"],
        [lastValid, "last"],
      ] as const) {
        if (edge !== first && edge !== last) continue;
        if (outcomeMedian > 0 && edge.outcome < partialRatio * outcomeMedian) {
          flagged.add(edge.rowNumber);
          issues.warning(
            "partial_week",
            edge.rowNumber,
            mapping.outcome,
            `Row ${edge.rowNumber}: the ${which} week of ${label} (${dayNumberToIsoDate(edge.day)}) has an outcome of ${formatNumber(edge.outcome)}, under ${Math.round(partialRatio * 100)} % of the cell's median week (${formatNumber(outcomeMedian)}). It may be a partial week; leave it out if so.`,
          );
        }
      }
      const scale = robustScale(outcomes, outcomeMedian);
      if (scale > 0) {
        for (const r of validRows) {
          const z = (r.outcome - outcomeMedian) / scale;
          if (Math.abs(z) > spikeZ && !flagged.has(r.rowNumber)) {
            issues.warning(
              "spike",
              r.rowNumber,
              mapping.outcome,
              `Row ${r.rowNumber}: the outcome of ${label} in week ${dayNumberToIsoDate(r.day)} is ${formatNumber(r.outcome)}, far from its typical week (median ${formatNumber(outcomeMedian)}, robust z-score ${formatNumber(Math.round(z * 10) / 10)}). Check it is not a typo.`,
            );
          }
        }
      }
    }

    for (let c = 0; c < C; c++) {
      const column = mapping.channels[c]?.column ?? "";
      const positive: number[] = [];
      const positiveRows: MutableRow[] = [];
      for (const r of validRows) {
        const x = r.spend[c] as number;
        if (x > 0) {
          positive.push(x);
          positiveRows.push(r);
        }
      }
      if (positive.length === 0) {
        zeroSpendCells.push({ label, channel: c });
        continue;
      }
      channelHasSpendSomewhere[c] = true;
      // Flighted channels have many zero weeks: judge spikes among the weeks with spend.
      if (positive.length < minWeeks) continue;
      const spendMedian = median(positive);
      const scale = robustScale(positive, spendMedian);
      if (scale <= 0) continue;
      positiveRows.forEach((r, i) => {
        const z = ((positive[i] as number) - spendMedian) / scale;
        if (z > spikeZ) {
          issues.warning(
            "spike",
            r.rowNumber,
            column,
            `Row ${r.rowNumber}: spend on ${channelNames[c]} for ${label} in week ${dayNumberToIsoDate(r.day)} is ${formatNumber(positive[i] as number)}, far above its typical week with spend (median ${formatNumber(spendMedian)}, robust z-score ${formatNumber(Math.round(z * 10) / 10)}). Check it is not a typo.`,
          );
        }
      });
    }
  }

  if (builtCells.length > 0) {
    for (let c = 0; c < C; c++) {
      if (channelHasSpendSomewhere[c]) continue;
      issues.warning(
        "channel_no_spend",
        null,
        mapping.channels[c]?.column ?? null,
        `No cell has any spend on ${channelNames[c]}; the model cannot learn its effect. Consider leaving the column out.`,
      );
    }
    for (const { label, channel } of zeroSpendCells) {
      if (!channelHasSpendSomewhere[channel]) continue;
      issues.warning(
        "channel_no_spend",
        null,
        mapping.channels[channel]?.column ?? null,
        `${label} has no spend on ${channelNames[channel]} in any week; the model will take the channel as absent there.`,
      );
    }
  }

  const allDays = cellSummaries.flatMap((s) => [s.firstWeek, s.lastWeek]).sort();
  const summary: DatasetSummary = {
    rows: rows.length,
    cells: cellSummaries,
    brands: [...brandNames.values()].sort(compareNames),
    markets: [...marketNames.values()].sort(compareNames),
    channels: channelNames,
    controls: [...mapping.controls],
    firstWeek: allDays[0] ?? null,
    lastWeek: allDays[allDays.length - 1] ?? null,
    totals: {
      outcome: outcomeTotal,
      spend: channelNames.map((channel, c) => ({ channel, total: spendTotals[c] as number })),
    },
  };
  return {
    report: issues.report(summary),
    mapping,
    cells: builtCells.map((cell) => ({
      brand: cell.brand,
      market: cell.market,
      rows: cell.rows.map((r) => ({ rowNumber: r.rowNumber, day: r.day, valid: r.valid, outcome: r.outcome, spend: r.spend, controls: r.controls })),
    })),
  };
}

/**
 * Validates tidy rows (one per week × brand × market) against a column mapping: errors
 * block saving, warnings do not. Row numbers are spreadsheet rows (header = row 1).
 */
export function validateTidyRows(
  header: readonly string[],
  rows: readonly (readonly string[])[],
  mapping: ColumnMapping,
  options: TidyValidationOptions = {},
): ValidationReport {
  return analyseTidyRows(header, rows, mapping, options).report;
}
