import Papa from "papaparse";

export type CsvValue = string | number | null;

/** Rows to CSV text. Cells that a spreadsheet would run as a formula are escaped. */
export function toCsv(headers: string[], rows: CsvValue[][]): string {
  return Papa.unparse({ fields: headers, data: rows.map((row) => row.map((value) => value ?? "")) }, { escapeFormulae: true });
}
