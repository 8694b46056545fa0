import { zodResolver } from "@hookform/resolvers/zod";
import { PUBLISH_REASON_MIN_LENGTH, type Run } from "@tributary/contracts";
import { useMemo } from "react";
import { useForm } from "react-hook-form";
import { TrustMark, trustStateOf } from "../../../components/trust-mark/trust-mark";
import { Button } from "../../../components/ui/button";
import { describedBy, inputClass } from "../../../components/ui/field";
import { ApiError } from "../../../lib/api-client";
import { formatDateTime } from "../../../lib/format";
import { publishRunInput, usePublishRun, type PublishRunInput } from "../api/publish-run";

/** Makes a finished run the current fit; a run that is not trustworthy needs a written reason. */
export function PublishPanel({ run }: { run: Run }) {
  const trustworthy = run.trust.trustworthy === true;
  const schema = useMemo(() => publishRunInput(trustworthy), [trustworthy]);
  const form = useForm<PublishRunInput>({ resolver: zodResolver(schema), defaultValues: { runId: run.id, reason: "" } });
  const publish = usePublishRun();
  const reasonError = form.formState.errors.reason?.message;

  if (run.publication) {
    return (
      <section aria-labelledby="publish-title" className="rounded-lg border border-line bg-surface p-5 shadow-card">
        <h2 id="publish-title" className="text-heading font-semibold text-ink-900">
          Published
        </h2>
        <p className="mt-2 text-small text-ink-800">
          Published {formatDateTime(run.publication.at)}
          {run.publication.by ? ` by ${run.publication.by.name}` : ""}.{" "}
          {run.current ? "This is the portfolio's current fit: its numbers appear on every results screen." : "A later run has since been published."}
        </p>
        {run.publication.reason ? (
          <p className="mt-2 text-small text-ink-800">
            <span className="font-semibold">Reason given:</span> “{run.publication.reason}”
          </p>
        ) : null}
      </section>
    );
  }

  const submit = form.handleSubmit((values) =>
    publish.mutate(values, {
      onError: (error) => {
        const issue = error instanceof ApiError ? error.issues.find((i) => i.path === "reason") : undefined;
        if (issue) form.setError("reason", { type: "server", message: issue.message });
      },
    }),
  );

  return (
    <section aria-labelledby="publish-title" className="rounded-lg border border-line bg-surface p-5 shadow-card">
      <div className="flex flex-wrap items-center gap-3">
        <h2 id="publish-title" className="text-heading font-semibold text-ink-900">
          Publish as the current fit
        </h2>
        <TrustMark state={trustStateOf(run.trust.trustworthy)} />
      </div>
      <p className="mt-2 max-w-3xl text-small text-ink-700">
        Publishing puts this run's numbers on every results screen and e-mails the market managers. Earlier published runs stay in the list.
      </p>
      <form onSubmit={submit} noValidate aria-label="Publish this run" className="mt-4 space-y-3">
        {!trustworthy ? (
          <div className="max-w-2xl">
            <label htmlFor="publish-reason" className="block text-small font-medium text-ink-800">
              Why publish a run that is not trustworthy? (required)
            </label>
            <textarea
              id="publish-reason"
              rows={3}
              maxLength={2000}
              aria-invalid={reasonError ? true : undefined}
              aria-describedby={describedBy("publish-reason", { help: true, error: reasonError })}
              className={`${inputClass} mt-1 w-full`}
              {...form.register("reason")}
            />
            <p id="publish-reason-help" className="mt-1 text-caption text-ink-600">
              At least {PUBLISH_REASON_MIN_LENGTH} characters. The reason is shown with the trust mark wherever this run appears.
            </p>
            {reasonError ? (
              <p id="publish-reason-error" className="mt-1 text-caption font-medium text-alert-700">
                {reasonError}
              </p>
            ) : null}
          </div>
        ) : null}
        <Button type="submit" disabled={publish.isPending}>
          {publish.isPending ? "Publishing…" : trustworthy ? "Publish as current fit" : "Publish anyway"}
        </Button>
        {publish.isError ? (
          <p role="alert" className="rounded-md bg-alert-100 px-3 py-2 text-small text-alert-700">
            {publish.error.message}
          </p>
        ) : null}
      </form>
    </section>
  );
}
