import { access, constants, rename, stat, unlink, writeFile } from "node:fs/promises";
import { basename, dirname, join, resolve } from "node:path";
import { UsageError } from "./usage-error";

/** Checks, before any work, that `out` can be written: its folder exists and is writable, and it is not a folder. */
export async function checkWritable(out: string, input?: string): Promise<void> {
  const target = resolve(out);
  if (input !== undefined && target === resolve(input)) throw new UsageError(`--out ${out}: that is the data file; choose another file for the result.`);
  const folder = dirname(target);
  try {
    const info = await stat(folder);
    if (!info.isDirectory()) throw new UsageError(`--out ${out}: ${folder} is not a folder.`);
    await access(folder, constants.W_OK);
  } catch (error) {
    if (error instanceof UsageError) throw error;
    const code = (error as NodeJS.ErrnoException).code;
    if (code === "ENOENT") throw new UsageError(`--out ${out}: the folder ${folder} does not exist.`);
    throw new UsageError(`--out ${out}: cannot write in ${folder} (${code ?? (error as Error).message}).`);
  }
  try {
    if ((await stat(target)).isDirectory()) throw new UsageError(`--out ${out}: is a folder; give a file name.`);
  } catch (error) {
    if (error instanceof UsageError) throw error;
  }
}

/** Writes `text` to `file` through a temporary file in the same folder and a rename, so readers never see half a file. */
export async function writeFileAtomic(file: string, text: string): Promise<void> {
  const target = resolve(file);
  const temporary = join(dirname(target), `.${basename(target)}.${process.pid}.${Date.now().toString(36)}.tmp`);
  try {
    await writeFile(temporary, text, { encoding: "utf8", flag: "wx" });
    await rename(temporary, target);
  } catch (error) {
    await unlink(temporary).catch(() => undefined);
    throw error;
  }
}
