import { readFile, stat } from "node:fs/promises";
import { DEFAULT_MAX_BYTES, guessColumnMapping, parseCsvText, readTidyCsv, type TidyCsvResult } from "@tributary/intake";
import type { PortfolioData } from "@tributary/stats";
import { UsageError } from "./usage-error";

type Issue = Extract<TidyCsvResult, { ok: false }>["report"]["errors"][number];
type Mapping = NonNullable<Extract<TidyCsvResult, { ok: true }>["mapping"]>;

export interface PortfolioFile {
  readonly data: PortfolioData;
  readonly mapping: Mapping;
  /** Warnings of the intake, each naming the file (and row and column where known). */
  readonly warnings: readonly string[];
  readonly rows: number;
}

/** One issue as a line naming the file, row and column: `data.csv: row 7, column "spend_search": …`. */
export function issueLine(file: string, issue: Pick<Issue, "row" | "column" | "message">): string {
  const where: string[] = [];
  if (issue.row !== null) where.push(`row ${issue.row}`);
  if (issue.column !== null) where.push(`column "${issue.column}"`);
  // the intake's messages often start with the row already; say it once
  const message = issue.row !== null ? issue.message.replace(new RegExp(`^Row ${issue.row}: `), "") : issue.message;
  return `${file}: ${where.length > 0 ? `${where.join(", ")}: ` : ""}${message}`;
}

function fileProblem(file: string, error: unknown): UsageError {
  const code = (error as NodeJS.ErrnoException).code;
  if (code === "ENOENT") return new UsageError(`${file}: file not found.`);
  if (code === "EISDIR") return new UsageError(`${file}: is a directory, not a CSV file.`);
  if (code === "EACCES" || code === "EPERM") return new UsageError(`${file}: cannot be read (permission denied).`);
  return new UsageError(`${file}: cannot be read (${(error as Error).message}).`);
}

async function readText(file: string): Promise<string> {
  try {
    const info = await stat(file);
    if (info.isDirectory()) throw Object.assign(new Error("is a directory"), { code: "EISDIR" });
    if (info.size > DEFAULT_MAX_BYTES) {
      throw new UsageError(`${file}: the file is ${(info.size / 1024 / 1024).toFixed(1)} MB; the largest accepted is ${DEFAULT_MAX_BYTES / 1024 / 1024} MB.`);
    }
    // invalid UTF-8 becomes U+FFFD, which the intake reports with its line
    return new TextDecoder("utf-8").decode(await readFile(file));
  } catch (error) {
    if (error instanceof UsageError) throw error;
    throw fileProblem(file, error);
  }
}

/** The column mapping with the outcome set to the named column (case-insensitive); null when the file cannot be parsed. */
function mappingWithOutcome(file: string, text: string, outcome: string): Mapping | null {
  const csv = parseCsvText(text);
  if (!csv.ok) return null;
  const column = csv.header.find((name) => name.toLowerCase() === outcome.toLowerCase());
  if (column === undefined) {
    throw new UsageError(`${file}: --outcome names column "${outcome}", which is not in the header (columns: ${csv.header.map((c) => `"${c}"`).join(", ")}).`);
  }
  const guess = guessColumnMapping(csv.header, csv.rows);
  if ([guess.week, guess.brand, guess.market].includes(column)) throw new UsageError(`${file}: --outcome "${column}" is the week, brand or market column.`);
  const channels = guess.channels.filter((c) => c.column !== column);
  const controls = guess.controls.filter((c) => c !== column);
  const used = new Set<string>([column, ...channels.map((c) => c.column), ...controls]);
  for (const role of [guess.week, guess.brand, guess.market]) if (role !== null) used.add(role);
  if (guess.week === null || guess.brand === null || guess.market === null) return null; // let the intake report what is missing
  return {
    week: guess.week,
    brand: guess.brand,
    market: guess.market,
    outcome: column,
    channels,
    controls,
    ignored: csv.header.filter((name) => !used.has(name)),
  };
}

/**
 * Reads and validates the tidy CSV with the shared intake. Throws a UsageError listing
 * every error found (file, row, column and message), so nothing is fitted on bad data.
 */
export async function readPortfolioFile(file: string, outcome: string | null): Promise<PortfolioFile> {
  const text = await readText(file);
  const mapping = outcome === null ? undefined : (mappingWithOutcome(file, text, outcome) ?? undefined);
  const result = readTidyCsv(text, mapping === undefined ? {} : { mapping });
  const warnings = result.report.warnings.map((w) => issueLine(file, w));
  if (!result.ok) {
    const lines = result.report.errors.map((e) => issueLine(file, e));
    const hidden = result.report.errorCount - result.report.errors.length;
    if (hidden > 0) lines.push(`${file}: … and ${hidden} more error${hidden === 1 ? "" : "s"} of the same kinds.`);
    if (result.report.errors.some((e) => e.code === "mapping_incomplete" && /outcome/i.test(e.message))) {
      lines.push("Choose the outcome column with --outcome <column>.");
    }
    if (lines.length === 0) lines.push(`${file}: the file could not be read as a tidy weekly CSV.`);
    throw new UsageError(lines.join("\n"));
  }
  const rows = result.data.cells.reduce((sum, cell) => sum + cell.outcome.length, 0);
  return { data: result.data, mapping: result.mapping, warnings, rows };
}
