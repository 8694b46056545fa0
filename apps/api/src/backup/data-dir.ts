// Where the database lives: DATA_DIR, or <repo>/.data/tributary. The server and the
// backup and restore commands read it the same way.
import { join, resolve } from "node:path";
import { repoRoot } from "../config";

export const defaultDataDir = join(repoRoot, ".data", "tributary");

export function dataDirFromEnv(env: NodeJS.ProcessEnv): string {
  return resolve(env.DATA_DIR || defaultDataDir);
}
