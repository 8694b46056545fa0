// Publishing a finished run as the portfolio's current one (from the Runs screen, or
// automatically for the demo's first fit): checks, the update and its audit entry.
import { eq } from "drizzle-orm";
import { PUBLISH_REASON_MIN_LENGTH, type Run } from "@tributary/contracts";
import type { Database } from "../db/client";
import { auditLog, runs } from "../db/schema";
import { Conflict, Invalid } from "../http/errors";
import { runRecord } from "./run-queries";

/** Publishes a succeeded run; an untrustworthy one needs a written reason. Returns the run as stored before publishing. */
export async function publishRun(db: Database, runId: string, userId: string, reasonInput: string | undefined, details: Record<string, unknown> = {}): Promise<Run> {
  const run = await runRecord(db, runId);
  if (run.status !== "succeeded") throw new Conflict(`Only a finished run can be published; this one is ${run.status}`);
  if (run.current) throw new Conflict("This run is already the current one");
  const reason = reasonInput && reasonInput.length > 0 ? reasonInput : null;
  if (run.trust.trustworthy !== true && (reason === null || reason.length < PUBLISH_REASON_MIN_LENGTH)) {
    throw new Invalid(
      `This run did not pass the convergence checks; to publish it anyway, write why (at least ${PUBLISH_REASON_MIN_LENGTH} characters). The reason is shown wherever its numbers appear.`,
      [{ path: "reason", message: `Write at least ${PUBLISH_REASON_MIN_LENGTH} characters on why this run can be used despite: ${run.trust.reasons.join(" ")}` }],
    );
  }
  await db.transaction(async (tx) => {
    await tx.update(runs).set({ publishedAt: new Date(), publishedBy: userId, publishReason: reason }).where(eq(runs.id, runId));
    await tx.insert(auditLog).values({
      userId,
      action: "run_published",
      target: `run:${runId}`,
      details: { trustworthy: run.trust.trustworthy, reason, datasetVersionId: run.datasetVersionId, ...details },
    });
  });
  return run;
}
