import type { ColumnMappingDraft, DatasetVersionDetail, UploadCreated, UploadValidation } from "@tributary/contracts";
import { useId, useState } from "react";
import { Button } from "../../../components/ui/button";
import { inputClass } from "../../../components/ui/field";
import { LoadingState } from "../../../components/ui/loading-state";
import { ApiError } from "../../../lib/api-client";
import { createUploadInput, useCreateUpload } from "../api/create-upload";
import { useSaveUpload } from "../api/save-upload";
import { useValidateUpload } from "../api/validate-upload";
import { ColumnMappingStep } from "./column-mapping-step";
import { FileDrop } from "./file-drop";
import { SeriesPreview } from "./series-preview";
import { ValidationReport } from "./validation-report";

type Step =
  | { kind: "choose" }
  | { kind: "map"; upload: UploadCreated; draft: ColumnMappingDraft | null }
  | { kind: "report"; upload: UploadCreated; draft: ColumnMappingDraft; validation: UploadValidation }
  | { kind: "saved"; version: DatasetVersionDetail };

function errorText(error: unknown): string {
  if (error instanceof ApiError) {
    const details = error.issues.map((issue) => issue.message).filter((message) => message !== error.message);
    return [error.message, ...details.slice(0, 5)].join(" ");
  }
  return error instanceof Error ? error.message : "Something went wrong.";
}

const stepNames = ["Choose a file", "Map the columns", "Check and save"] as const;

function Steps({ current }: { current: number }) {
  return (
    <ol aria-label="Steps" className="mb-5 flex flex-wrap gap-2 text-small">
      {stepNames.map((name, i) => (
        <li
          key={name}
          aria-current={i === current ? "step" : undefined}
          className={`flex items-center gap-2 rounded-full border px-3 py-1 ${
            i === current ? "border-stream-600 bg-stream-50 font-semibold text-stream-800" : i < current ? "border-line text-ink-700" : "border-line text-ink-500"
          }`}
        >
          <span aria-hidden="true" className="tabular-nums">
            {i + 1}
          </span>
          {name}
        </li>
      ))}
    </ol>
  );
}

type NewDatasetVersionProps = { currency: string; onSaved?: (version: DatasetVersionDetail) => void };

/** Upload → map → check → save, one step at a time. */
export function NewDatasetVersion({ currency, onSaved }: NewDatasetVersionProps) {
  const [step, setStep] = useState<Step>({ kind: "choose" });
  const [fileProblem, setFileProblem] = useState<string | null>(null);
  const [note, setNote] = useState("");
  const noteId = useId();
  const upload = useCreateUpload();
  const validate = useValidateUpload();
  const save = useSaveUpload({
    onSuccess: (version) => {
      setStep({ kind: "saved", version });
      setNote("");
      onSaved?.(version);
    },
  });

  function chooseFile(file: File) {
    const parsed = createUploadInput.safeParse({ file });
    if (!parsed.success) {
      setFileProblem(parsed.error.issues[0]?.message ?? "This file cannot be used");
      return;
    }
    setFileProblem(null);
    upload.mutate(parsed.data, { onSuccess: (created) => setStep({ kind: "map", upload: created, draft: null }) });
  }

  function check(draft: ColumnMappingDraft) {
    if (step.kind !== "map") return;
    const current = step.upload;
    validate.mutate(
      { uploadId: current.uploadId, mapping: draft },
      { onSuccess: (validation) => setStep({ kind: "report", upload: current, draft, validation }) },
    );
  }

  function restart() {
    upload.reset();
    validate.reset();
    save.reset();
    setFileProblem(null);
    setStep({ kind: "choose" });
  }

  const stepIndex = step.kind === "choose" ? 0 : step.kind === "map" ? 1 : 2;

  return (
    <section aria-labelledby="new-version-title" className="rounded-lg border border-line bg-surface p-5 shadow-card">
      <h2 id="new-version-title" className="mb-3 text-heading font-semibold text-ink-900">
        New dataset version
      </h2>
      {step.kind !== "saved" ? <Steps current={stepIndex} /> : null}

      {step.kind === "choose" ? (
        <div className="space-y-3">
          <FileDrop
            label="CSV file of weekly data"
            hint="A tidy CSV: one row per week, brand and market; up to 25 MB."
            onFile={chooseFile}
            disabled={upload.isPending}
          />
          {upload.isPending ? <LoadingState label="Reading the file…" /> : null}
          {fileProblem || upload.isError ? (
            <p role="alert" className="rounded-md bg-alert-100 px-3 py-2 text-small text-alert-700">
              {fileProblem ?? errorText(upload.error)}
            </p>
          ) : null}
        </div>
      ) : null}

      {step.kind === "map" ? (
        <div className="space-y-3">
          <ColumnMappingStep upload={step.upload} initial={step.draft} onSubmit={check} checking={validate.isPending} />
          {validate.isError ? (
            <p role="alert" className="rounded-md bg-alert-100 px-3 py-2 text-small text-alert-700">
              {errorText(validate.error)}
            </p>
          ) : null}
          <Button variant="quiet" onClick={restart}>
            Choose another file
          </Button>
        </div>
      ) : null}

      {step.kind === "report" ? (
        <div className="space-y-6">
          <ValidationReport report={step.validation.report} />
          {step.validation.newEntities.brands.length + step.validation.newEntities.markets.length + step.validation.newEntities.channels.length > 0 ? (
            <p className="rounded-md border border-line bg-ink-50 px-4 py-3 text-small text-ink-800">
              Saving adds to the workspace:{" "}
              {[
                step.validation.newEntities.brands.length > 0 ? `brands ${step.validation.newEntities.brands.join(", ")}` : null,
                step.validation.newEntities.markets.length > 0 ? `markets ${step.validation.newEntities.markets.join(", ")}` : null,
                step.validation.newEntities.channels.length > 0 ? `channels ${step.validation.newEntities.channels.join(", ")}` : null,
              ]
                .filter(Boolean)
                .join("; ")}
              .
            </p>
          ) : null}
          {step.validation.series.length > 0 ? (
            <SeriesPreview
              series={step.validation.series}
              channels={step.validation.channels}
              currency={currency}
              outcomeName={step.draft.outcome ?? "outcome"}
            />
          ) : null}
          <form
            aria-label="Save as a dataset version"
            className="space-y-3 border-t border-line pt-4"
            onSubmit={(event) => {
              event.preventDefault();
              const mapping = step.validation.mapping;
              if (!step.validation.canSave || !mapping) return;
              save.mutate({ uploadId: step.upload.uploadId, mapping, note: note.trim() === "" ? undefined : note.trim() });
            }}
          >
            <div>
              <label htmlFor={noteId} className="block text-small font-medium text-ink-800">
                Note on this version (optional)
              </label>
              <textarea
                id={noteId}
                value={note}
                maxLength={500}
                rows={2}
                onChange={(event) => setNote(event.target.value)}
                className={`${inputClass} mt-1 w-full max-w-2xl`}
                placeholder="What is new in this data, e.g. “adds September; corrects TV spend in Solvera”"
              />
            </div>
            <div className="flex flex-wrap items-center gap-3">
              <Button type="submit" disabled={!step.validation.canSave || save.isPending}>
                {save.isPending ? "Saving…" : "Save as dataset version"}
              </Button>
              <Button variant="secondary" onClick={() => setStep({ kind: "map", upload: step.upload, draft: step.draft })}>
                Back to the mapping
              </Button>
              <Button variant="quiet" onClick={restart}>
                Choose another file
              </Button>
              {!step.validation.canSave ? (
                <p className="text-small text-alert-700">Saving is blocked until the errors above are fixed in the file.</p>
              ) : null}
            </div>
            {save.isError ? (
              <p role="alert" className="rounded-md bg-alert-100 px-3 py-2 text-small text-alert-700">
                {errorText(save.error)}
              </p>
            ) : null}
          </form>
        </div>
      ) : null}

      {step.kind === "saved" ? (
        <div className="space-y-3">
          <p role="status" className="rounded-md bg-ok-100 px-4 py-3 text-small text-ok-700">
            Saved as dataset version {step.version.number} ({step.version.rows.toLocaleString("en-GB")} rows, {step.version.cellCount} cells). It never changes
            from now on; a corrected file becomes a new version.
          </p>
          <Button variant="secondary" onClick={restart}>
            Upload another file
          </Button>
        </div>
      ) : null}
    </section>
  );
}
