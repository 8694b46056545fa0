import { dayNumberToIsoDate, type ColumnMapping, type ValidationReport } from "@tributary/contracts";
import type { CellSeries, PortfolioData } from "@tributary/stats";
import { analyseTidyRows, type TidyAnalysis, type TidyValidationOptions } from "./tidy-rows";

export type PortfolioDataResult =
  | { readonly ok: true; readonly data: PortfolioData; readonly report: ValidationReport; readonly mapping: ColumnMapping }
  | { readonly ok: false; readonly report: ValidationReport };

/** Builds the model's data from an analysis without errors (cells already sorted, weeks consecutive). */
export function portfolioDataFromAnalysis(analysis: TidyAnalysis): PortfolioDataResult {
  const { report, mapping } = analysis;
  if (!report.ok || mapping === null) return { ok: false, report };
  const C = mapping.channels.length;
  const K = mapping.controls.length;
  const cells: CellSeries[] = analysis.cells.map((cell) => {
    const T = cell.rows.length;
    const outcome = new Float64Array(T);
    const spend = Array.from({ length: C }, () => new Float64Array(T));
    const controls = Array.from({ length: K }, () => new Float64Array(T));
    cell.rows.forEach((row, t) => {
      outcome[t] = row.outcome;
      for (let c = 0; c < C; c++) (spend[c] as Float64Array)[t] = row.spend[c] as number;
      for (let k = 0; k < K; k++) (controls[k] as Float64Array)[t] = row.controls[k] as number;
    });
    return { brand: cell.brand, market: cell.market, firstWeek: dayNumberToIsoDate((cell.rows[0]?.day ?? 0)), outcome, spend, controls };
  });
  return {
    ok: true,
    data: { channels: mapping.channels.map((c) => c.channel), controls: [...mapping.controls], cells },
    report,
    mapping,
  };
}

/**
 * Validates tidy rows and, only when there are no errors, returns the model's
 * PortfolioData: cells sorted by brand then market, each with consecutive weeks.
 */
export function toPortfolioData(
  header: readonly string[],
  rows: readonly (readonly string[])[],
  mapping: ColumnMapping,
  options: TidyValidationOptions = {},
): PortfolioDataResult {
  return portfolioDataFromAnalysis(analyseTidyRows(header, rows, mapping, options));
}
