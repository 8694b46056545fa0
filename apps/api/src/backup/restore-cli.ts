// pnpm restore <file> [--force] [--check]: a backup made by `pnpm backup` into DATA_DIR.
import { BackupRefused, restoreBackup } from "./backup-file";
import { cliArguments, describeManifest, userPath } from "./cli-output";
import { dataDirFromEnv } from "./data-dir";

const usage = `Usage: pnpm restore <file> [--force] [--check]

Restores a backup made by \`pnpm backup\` into DATA_DIR (now ${dataDirFromEnv(process.env)}).
The file is checked first (its kind, its checksum, its database migration level) and the
restored copy is compared with what the backup recorded. Stop the server first.
DATA_DIR must be empty or absent; --force replaces a database there (the old directory is
kept beside it, renamed). --check verifies the file and writes nothing.`;

async function main(): Promise<number> {
  let args;
  try {
    args = cliArguments(process.argv.slice(2), true);
  } catch (error) {
    console.error(`${error instanceof Error ? error.message : String(error)}\n\n${usage}`);
    return 2;
  }
  if (args.help) {
    console.log(usage);
    return 0;
  }
  if (!args.file) {
    console.error(`Give the backup file to restore.\n\n${usage}`);
    return 2;
  }
  const file = userPath(args.file);
  const dataDir = dataDirFromEnv(process.env);
  try {
    const result = await restoreBackup(file, dataDir, { force: args.force, check: args.check });
    const lines = [
      result.checkOnly ? `${file} is a sound backup; it can be restored (nothing was written).` : `Restored ${file} into ${result.dataDir}`,
      describeManifest(result.manifest),
    ];
    if (result.previousMovedTo) lines.push(`  the database that was there is kept in ${result.previousMovedTo} (delete it when you no longer need it)`);
    if (result.pendingMigrations > 0) lines.push(`  the next server start brings it up to date (${result.pendingMigrations} newer database migration(s))`);
    console.log(lines.join("\n"));
    return 0;
  } catch (error) {
    console.error(error instanceof BackupRefused ? `Nothing was restored: ${error.message}` : `The restore failed: ${error instanceof Error ? error.message : String(error)}`);
    return 1;
  }
}

process.exitCode = await main();
