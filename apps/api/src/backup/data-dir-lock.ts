// One process at a time per data directory. PGlite does not stop a second process from
// opening the same files (two would overwrite each other's pages), so the server, the
// backup and the restore commands each take this lock file first. A lock left by a
// process that died (killed, machine restarted) is taken over.
import { closeSync, existsSync, openSync, readFileSync, unlinkSync, writeFileSync, writeSync } from "node:fs";
import { hostname } from "node:os";
import { join } from "node:path";

export const LOCK_FILE_NAME = "tributary.lock";

export interface LockOwner {
  readonly pid: number;
  readonly host: string;
  /** What holds it: "server", "backup" or "restore". */
  readonly purpose: string;
  readonly startedAt: string;
  /** Linux: the boot and the process's start time, so a reused process id is not taken for the owner. */
  readonly bootId: string | null;
  readonly processStart: string | null;
}

export class DataDirLocked extends Error {
  constructor(
    readonly dataDir: string,
    readonly owner: LockOwner | null,
  ) {
    super(lockedMessage(dataDir, owner));
    this.name = "DataDirLocked";
  }
}

function lockedMessage(dataDir: string, owner: LockOwner | null): string {
  const file = join(dataDir, LOCK_FILE_NAME);
  if (!owner) return `The data directory ${dataDir} is locked by another Tributary process (its lock file ${file} cannot be read).`;
  const who = owner.purpose === "server" ? "A Tributary server" : `A Tributary ${owner.purpose}`;
  const where = owner.host === hostname() ? `process ${owner.pid}` : `process ${owner.pid} on ${owner.host}`;
  return (
    `${who} (${where}, since ${owner.startedAt}) is using the data directory ${dataDir}. ` +
    `Stop it first. If it is no longer running, delete ${file} and try again.`
  );
}

function readOrNull(path: string): string | null {
  try {
    return readFileSync(path, "utf8").trim();
  } catch {
    return null;
  }
}

const bootId = (): string | null => readOrNull("/proc/sys/kernel/random/boot_id");

/** Field 22 of /proc/<pid>/stat: when the process started, in clock ticks since boot. */
function processStart(pid: number): string | null {
  const stat = readOrNull(`/proc/${pid}/stat`);
  if (stat === null) return null;
  // The command name (field 2) may hold spaces and parentheses: count from the last ")".
  const fields = stat.slice(stat.lastIndexOf(")") + 2).split(" ");
  return fields[19] ?? null;
}

function isAlive(pid: number): boolean {
  try {
    process.kill(pid, 0);
    return true;
  } catch (error) {
    // EPERM: it exists but belongs to someone else.
    return (error as NodeJS.ErrnoException).code === "EPERM";
  }
}

function parseOwner(text: string | null): LockOwner | null {
  if (text === null) return null;
  try {
    const value = JSON.parse(text) as Partial<LockOwner>;
    if (typeof value.pid !== "number" || typeof value.host !== "string") return null;
    return {
      pid: value.pid,
      host: value.host,
      purpose: typeof value.purpose === "string" ? value.purpose : "process",
      startedAt: typeof value.startedAt === "string" ? value.startedAt : "an unknown time",
      bootId: typeof value.bootId === "string" ? value.bootId : null,
      processStart: typeof value.processStart === "string" ? value.processStart : null,
    };
  } catch {
    return null;
  }
}

/** True when the lock's owner certainly no longer runs (on this machine); a lock of another host is never stale. */
export function isStale(owner: LockOwner): boolean {
  if (owner.host !== hostname()) return false;
  if (owner.pid === process.pid) return true;
  const boot = bootId();
  if (owner.bootId && boot && owner.bootId !== boot) return true;
  if (!isAlive(owner.pid)) return true;
  const start = processStart(owner.pid);
  return owner.processStart !== null && start !== null && start !== owner.processStart;
}

/** The process holding the lock now, or null when nobody (or only a dead process) does. */
export function lockHolder(dataDir: string): LockOwner | null {
  const path = join(dataDir, LOCK_FILE_NAME);
  if (!existsSync(path)) return null;
  const owner = parseOwner(readOrNull(path));
  if (owner && isStale(owner)) return null;
  return owner ?? { pid: 0, host: "unknown", purpose: "process", startedAt: "an unknown time", bootId: null, processStart: null };
}

export interface DataDirLock {
  readonly path: string;
  /** Removes the lock file if it is still this process's. Safe to call more than once. */
  release(): void;
  /** Writes this process's lock file again (after something replaced the directory's files). */
  refresh(): void;
}

/**
 * Takes the lock of `dataDir` (which must exist) for this process, or throws
 * DataDirLocked naming the process that holds it.
 */
export function acquireDataDirLock(dataDir: string, purpose: string): DataDirLock {
  const path = join(dataDir, LOCK_FILE_NAME);
  const owner: LockOwner = {
    pid: process.pid,
    host: hostname(),
    purpose,
    startedAt: new Date().toISOString(),
    bootId: bootId(),
    processStart: processStart(process.pid),
  };
  const text = `${JSON.stringify(owner)}\n`;
  for (let attempt = 0; attempt < 2; attempt++) {
    try {
      // "wx": created only if absent, so two processes starting together cannot both win.
      const fd = openSync(path, "wx");
      try {
        writeSync(fd, text);
      } finally {
        closeSync(fd);
      }
      let released = false;
      return {
        path,
        release: () => {
          if (released) return;
          released = true;
          if (parseOwner(readOrNull(path))?.pid === process.pid) unlinkSync(path);
        },
        refresh: () => {
          if (!released) writeFileSync(path, text);
        },
      };
    } catch (error) {
      if ((error as NodeJS.ErrnoException).code !== "EEXIST") throw error;
      const current = parseOwner(readOrNull(path));
      if (!current || !isStale(current)) throw new DataDirLocked(dataDir, current);
      // Left by a process that died: remove it and try once more.
      try {
        unlinkSync(path);
      } catch (unlinkError) {
        if ((unlinkError as NodeJS.ErrnoException).code !== "ENOENT") throw unlinkError;
      }
    }
  }
  throw new DataDirLocked(dataDir, parseOwner(readOrNull(path)));
}
