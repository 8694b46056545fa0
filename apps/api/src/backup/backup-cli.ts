// pnpm backup [<file>] [--force]: the whole workspace (its database) in DATA_DIR to one file.
import { BACKUP_EXTENSION, BackupRefused, createBackup } from "./backup-file";
import { cliArguments, describeManifest, megabytes, userPath } from "./cli-output";
import { dataDirFromEnv } from "./data-dir";

const usage = `Usage: pnpm backup [<file>] [--force]

Writes the Tributary workspace in DATA_DIR (now ${dataDirFromEnv(process.env)}) to one
file: every table, verified before and recorded in the file's manifest. Stop the server
first. Without <file>: tributary-<date>-<time>${BACKUP_EXTENSION} in this folder.
--force replaces an existing file.`;

async function main(): Promise<number> {
  let args;
  try {
    args = cliArguments(process.argv.slice(2), false);
  } catch (error) {
    console.error(`${error instanceof Error ? error.message : String(error)}\n\n${usage}`);
    return 2;
  }
  if (args.help) {
    console.log(usage);
    return 0;
  }
  const stamp = new Date().toISOString().slice(0, 19).replace("T", "-").replaceAll(":", "");
  const file = userPath(args.file ?? `tributary-${stamp}${BACKUP_EXTENSION}`);
  const dataDir = dataDirFromEnv(process.env);
  try {
    const { manifest } = await createBackup(dataDir, file, { force: args.force });
    console.log(`Backed up ${dataDir} to ${file} (${megabytes(manifest.payload.bytes)})\n${describeManifest(manifest)}`);
    return 0;
  } catch (error) {
    console.error(error instanceof BackupRefused ? `Nothing was backed up: ${error.message}` : `The backup failed: ${error instanceof Error ? error.message : String(error)}`);
    return 1;
  }
}

process.exitCode = await main();
