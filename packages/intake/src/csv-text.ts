import Papa from "papaparse";
import type { ValidationReport } from "@tributary/contracts";
import { IssueList, type IssueLimits } from "./issue-list";
import { formatNumber, plural } from "./message-text";

export const DEFAULT_MAX_BYTES = 25 * 1024 * 1024;
export const DEFAULT_MAX_COLUMNS = 500;
const MAX_COLUMN_NAME_LENGTH = 200;

export interface CsvTextOptions extends IssueLimits {
  /** Largest accepted size of the text in UTF-8 bytes (default 25 MiB). */
  readonly maxBytes?: number;
  /** Most columns accepted (default 500). */
  readonly maxColumns?: number;
}

/** A CSV read into strings: the header and the data rows, blank rows left out. */
export interface ParsedCsv {
  /** Column names, trimmed. */
  readonly header: readonly string[];
  /** Data rows, each exactly as long as the header. */
  readonly rows: readonly (readonly string[])[];
  /** Spreadsheet row number of each data row (the header is row 1; blank rows still count). */
  readonly rowNumbers: readonly number[];
}

export type CsvTextResult = ({ readonly ok: true } & ParsedCsv) | { readonly ok: false; readonly report: ValidationReport };

/** Size of a string in UTF-8 bytes, without encoding it. */
export function utf8ByteLength(text: string): number {
  let bytes = 0;
  for (let i = 0; i < text.length; i++) {
    const code = text.charCodeAt(i);
    if (code < 0x80) bytes += 1;
    else if (code < 0x800) bytes += 2;
    else if (code >= 0xd800 && code <= 0xdbff && i + 1 < text.length) {
      const next = text.charCodeAt(i + 1);
      if (next >= 0xdc00 && next <= 0xdfff) {
        bytes += 4;
        i++;
      } else bytes += 3;
    } else bytes += 3;
  }
  return bytes;
}

/** Line number (1-based) of a character offset. */
function lineOf(text: string, offset: number): number {
  let line = 1;
  for (let i = 0; i < offset; i++) if (text.charCodeAt(i) === 10) line++;
  return line;
}

function formatBytes(bytes: number): string {
  if (bytes >= 1024 * 1024) return `${formatNumber(bytes / (1024 * 1024))} MB`;
  if (bytes >= 1024) return `${formatNumber(bytes / 1024)} KB`;
  return plural(bytes, "byte");
}

/** What a file that is not CSV text looks like, from its first characters; null if nothing known. */
function knownBinaryFormat(text: string): string | null {
  if (text.startsWith("%PDF-")) return "This is a PDF document, not a CSV file. Export the data as CSV (UTF-8) and upload that.";
  if (text.startsWith("PK\u0003\u0004") || text.startsWith("PK\u0005\u0006")) {
    return "This is a zip archive (an Excel .xlsx workbook is one), not a CSV file. Open it in your spreadsheet and save the sheet as CSV (UTF-8).";
  }
  if (/^[\u00d0\ufffd][\u00cf\ufffd]\u0011[\u00e0\ufffd]/.test(text)) {
    return "This looks like an old Excel (.xls) workbook, not a CSV file. Open it in your spreadsheet and save the sheet as CSV (UTF-8).";
  }
  if (/^\u001f[\u008b\ufffd]/.test(text)) return "This is a compressed (gzip) file, not a CSV file. Decompress it first.";
  if (/^\s*<(?:!doctype|html|\?xml|svg)/i.test(text)) return "This looks like a web page or an XML document, not a CSV file.";
  if (/^\s*[{[]\s*["{[\]]/.test(text)) return "This looks like a JSON document, not a CSV file.";
  return null;
}

function failed(issues: IssueList): CsvTextResult {
  return { ok: false, report: issues.report(null) };
}

/**
 * Reads CSV text (comma-separated, double-quoted fields, any line endings, optional
 * byte-order mark) into a header and rows of strings. Never throws: a file that cannot
 * be read comes back as a report with at least one error.
 */
export function parseCsvText(text: string, options: CsvTextOptions = {}): CsvTextResult {
  const issues = new IssueList(options);
  const maxBytes = options.maxBytes ?? DEFAULT_MAX_BYTES;
  const maxColumns = options.maxColumns ?? DEFAULT_MAX_COLUMNS;

  if (typeof text !== "string") {
    issues.error("not_csv", null, null, "The upload is not text, so it cannot be a CSV file.");
    return failed(issues);
  }
  // UTF-8 never takes fewer bytes than UTF-16 code units, so a long string is too large outright.
  const bytes = text.length > maxBytes ? text.length : utf8ByteLength(text);
  if (bytes > maxBytes) {
    issues.error("file_too_large", null, null, `The file is ${formatBytes(bytes)}; the largest accepted is ${formatBytes(maxBytes)}.`);
    return failed(issues);
  }
  const body = text.charCodeAt(0) === 0xfeff ? text.slice(1) : text;
  if (body.trim() === "") {
    issues.error("file_empty", null, null, "The file is empty.");
    return failed(issues);
  }
  const format = knownBinaryFormat(body);
  if (format !== null) {
    issues.error("not_csv", null, null, format);
    return failed(issues);
  }
  if (body.includes("\u0000")) {
    issues.error("not_csv", null, null, "The file contains binary data (NUL bytes), so it is not a CSV file. Save the sheet as CSV (UTF-8) and upload that.");
    return failed(issues);
  }
  const replacement = body.indexOf("\ufffd");
  if (replacement >= 0) {
    issues.error(
      "not_utf8",
      null,
      null,
      `Line ${lineOf(body, replacement)} holds bytes that are not valid UTF-8 text (shown as �). Save the file with the encoding "CSV UTF-8" and upload it again.`,
    );
    return failed(issues);
  }
  const control = body.search(/[\u0001-\u0008\u000b\u000c\u000e-\u001f\u007f]/);
  if (control >= 0) {
    issues.error("control_characters", null, null, `Line ${lineOf(body, control)} contains control characters that do not belong in a CSV file.`);
    return failed(issues);
  }

  const normalised = body.replace(/\r\n?/g, "\n");
  const parsed = Papa.parse<string[]>(normalised, { delimiter: ",", newline: "\n", quoteChar: '"', header: false, skipEmptyLines: false });
  const quoteErrors = parsed.errors.filter((e) => e.type === "Quotes");
  if (quoteErrors.length > 0) {
    const seen = new Set<number>();
    for (const e of quoteErrors) {
      const row = (e.row ?? 0) + 1;
      if (seen.has(row)) continue;
      seen.add(row);
      const what =
        e.code === "MissingQuotes"
          ? "opens a quoted value that is never closed"
          : "has a quoted value with text after its closing quote";
      issues.error("malformed_quotes", row, null, `Row ${row} ${what}. Inside a quoted value, write a double quote as "".`);
    }
    return failed(issues);
  }

  const records = parsed.data;
  const isBlank = (record: readonly string[]) => record.every((field) => field.trim() === "");
  let headerIndex = 0;
  while (headerIndex < records.length && isBlank(records[headerIndex] ?? [])) headerIndex++;
  const rawHeader = records[headerIndex];
  if (rawHeader === undefined) {
    issues.error("file_empty", null, null, "The file is empty.");
    return failed(issues);
  }
  const headerRow = headerIndex + 1;

  if (rawHeader.length === 1) {
    const only = rawHeader[0] ?? "";
    if (only.includes(";")) {
      issues.error("wrong_delimiter", headerRow, null, "The values seem to be separated by semicolons. Tributary reads comma-separated files: export the sheet as CSV (comma delimited).");
      return failed(issues);
    }
    if (only.includes("\t")) {
      issues.error("wrong_delimiter", headerRow, null, "The values seem to be separated by tabs. Tributary reads comma-separated files: export the sheet as CSV (comma delimited).");
      return failed(issues);
    }
  }
  if (rawHeader.length > maxColumns) {
    issues.error("too_many_columns", headerRow, null, `The header has ${formatNumber(rawHeader.length)} columns; at most ${formatNumber(maxColumns)} are accepted.`);
    return failed(issues);
  }

  const names = rawHeader.map((name) => name.trim());
  // Spreadsheets often export trailing empty, unnamed columns; drop them when nothing is in them.
  let width = names.length;
  while (width > 1 && names[width - 1] === "" && records.every((record, i) => i <= headerIndex || (record[width - 1] ?? "").trim() === "")) width--;
  const header = names.slice(0, width);

  const firstColumnByKey = new Map<string, number>();
  header.forEach((name, index) => {
    const column = index + 1;
    if (name === "") {
      issues.error("header_invalid", headerRow, null, `Column ${column} has no name in the header row. Give every column a name.`);
      return;
    }
    if (Array.from(name).length > MAX_COLUMN_NAME_LENGTH) {
      issues.error("header_invalid", headerRow, name.slice(0, 40), `Column ${column} has a name longer than ${MAX_COLUMN_NAME_LENGTH} characters.`);
      return;
    }
    const key = name.toLowerCase();
    const first = firstColumnByKey.get(key);
    if (first !== undefined) {
      issues.error("header_invalid", headerRow, name, `The column name "${name}" appears twice (columns ${first} and ${column}); column names must differ (case does not count).`);
    } else firstColumnByKey.set(key, column);
  });

  const rows: string[][] = [];
  const rowNumbers: number[] = [];
  for (let index = headerIndex + 1; index < records.length; index++) {
    const record = records[index] ?? [];
    if (isBlank(record)) continue;
    const row = index + 1;
    let cells = record;
    if (record.length !== width) {
      const extraEmpty = record.length > width && record.length <= rawHeader.length && record.slice(width).every((field) => field.trim() === "");
      if (!extraEmpty) {
        issues.error("column_count", row, null, `Row ${row} has ${plural(record.length, "value")} but the header has ${plural(width, "column")}.`);
        continue;
      }
      cells = record.slice(0, width);
    }
    rows.push(cells);
    rowNumbers.push(row);
  }
  if (!issues.hasErrors() && rows.length === 0) {
    issues.error("no_data_rows", null, null, "The file has a header row but no data rows.");
  }
  if (issues.hasErrors()) return failed(issues);
  return { ok: true, header, rows, rowNumbers };
}
