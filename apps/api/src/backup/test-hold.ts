// A hook for the crash tests (off unless set, and only with NODE_ENV=test):
// TRIBUTARY_TEST_HOLD="<text>#<n>" makes the server stop dead just before the n-th SQL
// statement containing <text> runs — it prints one line to stderr, then blocks its
// thread (at most 2 minutes, then goes on) — so a test can kill it at a known point,
// e.g. in the middle of a dataset save's transaction ('insert into "dataset_rows"#3').
import { writeSync } from "node:fs";

export const TEST_HOLD_VARIABLE = "TRIBUTARY_TEST_HOLD";
/** The line printed when the hold starts (the crash tests wait for it). */
export const TEST_HOLD_LINE = "tributary-test-hold: holding";
const HOLD_MS = 120_000;

export interface TestHold {
  readonly text: string;
  readonly occurrence: number;
}

/** The hold asked for in the environment, or null; throws a clear message on a bad value. */
export function testHoldFromEnv(env: NodeJS.ProcessEnv): TestHold | null {
  const raw = env[TEST_HOLD_VARIABLE];
  if (raw === undefined || raw === "") return null;
  if (env.NODE_ENV !== "test") throw new Error(`${TEST_HOLD_VARIABLE} is a test hook; it is only accepted with NODE_ENV=test`);
  const at = raw.lastIndexOf("#");
  const occurrence = at > 0 ? Number(raw.slice(at + 1)) : Number.NaN;
  if (!Number.isInteger(occurrence) || occurrence < 1) throw new Error(`${TEST_HOLD_VARIABLE} must look like '<SQL text>#<n>' with n ≥ 1, got "${raw}"`);
  return { text: raw.slice(0, at).toLowerCase(), occurrence };
}

/** A query observer for createDatabase's `onQuery` that carries out the hold. */
export function holdingObserver(hold: TestHold): (sql: string) => void {
  let seen = 0;
  return (sql) => {
    if (!sql.toLowerCase().includes(hold.text)) return;
    seen++;
    if (seen !== hold.occurrence) return;
    // Written synchronously: the line is out before the thread stops.
    writeSync(2, `${TEST_HOLD_LINE} before statement ${seen} containing "${hold.text}"\n`);
    Atomics.wait(new Int32Array(new SharedArrayBuffer(4)), 0, 0, HOLD_MS);
  };
}
