// What the backup and restore commands print, and how they read their arguments.
import { resolve } from "node:path";
import { parseArgs } from "node:util";
import type { BackupManifest } from "./backup-file";

/** A path as typed by the person: relative to the folder they ran `pnpm` in (pnpm runs scripts from the repository root). */
export function userPath(path: string, env: NodeJS.ProcessEnv = process.env): string {
  return resolve(env.INIT_CWD || process.cwd(), path);
}

export interface CliArguments {
  readonly file: string | undefined;
  readonly force: boolean;
  readonly check: boolean;
  readonly help: boolean;
}

/** Parses `<file> [--force] [--check] [--help]`; throws a plain message on anything else. */
export function cliArguments(args: readonly string[], allowCheck: boolean): CliArguments {
  const { values, positionals } = parseArgs({
    args: [...args],
    allowPositionals: true,
    options: { force: { type: "boolean", default: false }, check: { type: "boolean", default: false }, help: { type: "boolean", short: "h", default: false } },
    strict: true,
  });
  if (positionals.length > 1) throw new Error(`Give one file, got ${positionals.length}: ${positionals.join(", ")}`);
  if (values.check && !allowCheck) throw new Error("--check is an option of the restore command");
  return { file: positionals[0], force: values.force === true, check: values.check === true, help: values.help === true };
}

const tableLabels: Record<string, string> = {
  users: "users",
  dataset_versions: "dataset versions",
  dataset_rows: "weekly data rows",
  runs: "fit runs",
  plans: "plans",
  flags: "flags",
  audit_log: "audit entries",
};

export function megabytes(bytes: number): string {
  return `${(bytes / 1024 / 1024).toFixed(1)} MB`;
}

/** A few lines describing a backup for people. */
export function describeManifest(manifest: BackupManifest): string {
  const tables = Object.entries(manifest.tables);
  const total = tables.reduce((sum, [, t]) => sum + t.rows, 0);
  const highlights = Object.entries(tableLabels)
    .filter(([name]) => manifest.tables[name] !== undefined)
    .map(([name, label]) => `${label} ${manifest.tables[name]!.rows.toLocaleString("en")}`);
  return [
    `  made ${manifest.createdAt} by Tributary ${manifest.appVersion} from ${manifest.source}`,
    `  database: PGlite ${manifest.database.pgliteVersion} (Postgres ${manifest.database.postgresVersion}), migration level ${manifest.migrations.level}`,
    `  ${tables.length} tables, ${total.toLocaleString("en")} rows: ${highlights.join(", ")}`,
  ].join("\n");
}
