import type { ColumnMapping, IntakeIssue, ValidationReport } from "@tributary/contracts";
import type { PortfolioData } from "@tributary/stats";
import { guessColumnMapping, type ColumnMappingGuess } from "./column-mapping";
import { parseCsvText, type CsvTextOptions } from "./csv-text";
import { reportOf, withIssues } from "./issue-list";
import { portfolioDataFromAnalysis } from "./portfolio-data";
import { analyseTidyRows, type TidyValidationOptions } from "./tidy-rows";

export interface TidyCsvOptions extends CsvTextOptions, Omit<TidyValidationOptions, "rowNumbers"> {
  /** The column mapping; when left out, it is guessed from the header (as the `fit` command does). */
  readonly mapping?: ColumnMapping;
}

export type TidyCsvResult =
  | {
      readonly ok: true;
      readonly data: PortfolioData;
      readonly report: ValidationReport;
      readonly mapping: ColumnMapping;
      readonly header: readonly string[];
    }
  | {
      readonly ok: false;
      readonly report: ValidationReport;
      /** The mapping used or guessed, or null when the file could not be read. */
      readonly mapping: ColumnMapping | ColumnMappingGuess | null;
      readonly header: readonly string[] | null;
    };

/**
 * The whole intake of a tidy CSV text: read it, map its columns (given or guessed),
 * validate, and build the model's data when there are no errors. Never throws.
 */
export function readTidyCsv(text: string, options: TidyCsvOptions = {}): TidyCsvResult {
  const csv = parseCsvText(text, options);
  if (!csv.ok) return { ok: false, report: csv.report, mapping: null, header: null };
  let mapping: ColumnMapping;
  const notices: IntakeIssue[] = [];
  if (options.mapping !== undefined) mapping = options.mapping;
  else {
    const guess = guessColumnMapping(csv.header, csv.rows);
    const { week, brand, market, outcome, channels } = guess;
    if (week === null || brand === null || market === null || outcome === null || channels.length === 0) {
      const issues: IntakeIssue[] = guess.notes.map((note) => ({
        severity: note.role === "ignored" ? "warning" : "error",
        code: note.role === "ignored" ? "column_ignored" : "mapping_incomplete",
        row: null,
        column: null,
        message: note.message,
      }));
      return { ok: false, report: reportOf(issues, null, options), mapping: guess, header: csv.header };
    }
    mapping = { week, brand, market, outcome, channels: [...channels], controls: [...guess.controls], ignored: [...guess.ignored] };
    for (const note of guess.notes) notices.push({ severity: "warning", code: "column_ignored", row: null, column: null, message: note.message });
    if (guess.ignored.length > 0) {
      const names = guess.ignored.map((column) => `"${column}"`).join(", ");
      notices.push({ severity: "warning", code: "column_ignored", row: null, column: null, message: `Not used: ${names}.` });
    }
  }
  const analysis = analyseTidyRows(csv.header, csv.rows, mapping, { ...options, rowNumbers: csv.rowNumbers });
  const result = portfolioDataFromAnalysis({ ...analysis, report: withIssues(analysis.report, notices, options) });
  if (!result.ok) return { ok: false, report: result.report, mapping: analysis.mapping ?? mapping, header: csv.header };
  return { ok: true, data: result.data, report: result.report, mapping: result.mapping, header: csv.header };
}
