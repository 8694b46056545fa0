// Which published run a dashboard's numbers come from: when it was fitted and published,
// on which data, and its trust mark (with the publisher's reason when it is not trustworthy).
import type { Run } from "@tributary/contracts";
import { formatDateTime } from "../../lib/format";
import { TrustMark, trustStateOf } from "../trust-mark/trust-mark";

type RunStampProps = {
  run: Run;
  /** What the numbers are, e.g. "Numbers on this screen". */
  lead?: string;
};

/** A short name of the run that people can say aloud and find again in Runs. */
export function runLabel(run: Pick<Run, "id" | "datasetVersionNumber">): string {
  return `run ${run.id.slice(0, 8)} (dataset version ${run.datasetVersionNumber})`;
}

export function RunStamp({ run, lead = "Numbers on this screen come from" }: RunStampProps) {
  const state = trustStateOf(run.trust.trustworthy);
  return (
    <section
      aria-label="Published run"
      className="mb-6 flex items-start justify-between gap-x-6 rounded-lg border border-line bg-surface px-4 py-3 shadow-card"
    >
      <div className="min-w-0 flex-1 text-small text-ink-800">
        <p>
          {lead} {run.current ? "the current published fit" : "a run that is not the current published fit"},{" "}
          <strong className="font-semibold text-ink-950">{runLabel(run)}</strong>.
        </p>
        <p className="text-caption text-ink-600">
          {run.finishedAt ? <>Fitted {formatDateTime(run.finishedAt)}</> : <>Started {formatDateTime(run.createdAt)}</>}
          {run.publication ? (
            <>
              {" "}
              · published {formatDateTime(run.publication.at)}
              {run.publication.by ? ` by ${run.publication.by.name}` : ""}
            </>
          ) : null}
        </p>
      </div>
      <div className="flex w-72 shrink-0 flex-col items-start gap-1">
        <TrustMark state={state} size="md" publishReason={run.publication?.reason} />
        {state === "untrustworthy" && run.trust.reasons.length > 0 ? (
          <details className="max-w-md text-caption text-ink-700">
            <summary className="cursor-pointer font-medium text-stream-700">Why it is not trustworthy</summary>
            <ul className="mt-1 list-disc space-y-1 pl-4">
              {run.trust.reasons.map((reason) => (
                <li key={reason}>{reason}</li>
              ))}
            </ul>
          </details>
        ) : null}
      </div>
    </section>
  );
}
