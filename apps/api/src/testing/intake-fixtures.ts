// Test helpers for the data intake: the example file, changed one value at a time, and
// row counts of every table an upload could touch.
import { count } from "drizzle-orm";
import type { Database } from "../db/client";
import { auditLog, brands, cells, channels, datasetRows, datasetVersions, liftTests, markets, modelSettings, runs } from "../db/schema";
import { exampleCsv } from "../datasets/example-csv";

/** The example CSV with one value replaced: `row` is the spreadsheet row (header = 1). */
export function exampleWith(row: number, column: string, value: string): string {
  const lines = exampleCsv().trimEnd().split("\n");
  const header = lines[0]!.split(",");
  const index = header.indexOf(column);
  if (index < 0) throw new Error(`no column ${column}`);
  const fields = lines[row - 1]!.split(",");
  fields[index] = value;
  lines[row - 1] = fields.join(",");
  return `${lines.join("\n")}\n`;
}

/** The example CSV with some lines (spreadsheet rows) changed by `edit`. */
export function exampleLines(edit: (lines: string[]) => string[]): string {
  return `${edit(exampleCsv().trimEnd().split("\n")).join("\n")}\n`;
}

/** Rows in every table an upload, save or fit could write. */
export async function tableCounts(db: Database): Promise<Record<string, number>> {
  const tables = { brands, markets, channels, cells, datasetVersions, datasetRows, liftTests, modelSettings, runs, auditLog };
  const entries = await Promise.all(
    Object.entries(tables).map(async ([name, table]) => {
      const [row] = await db.select({ n: count() }).from(table);
      return [name, row?.n ?? 0] as const;
    }),
  );
  return Object.fromEntries(entries);
}
