import type { DatasetVersion, LiftTestRecord, ValidationReport as Report } from "@tributary/contracts";
import { useId, useState } from "react";
import { DataTable, type DataTableColumn } from "../../../components/data-table/data-table";
import { Button } from "../../../components/ui/button";
import { inputClass } from "../../../components/ui/field";
import { ErrorState } from "../../../components/ui/error-state";
import { LoadingState } from "../../../components/ui/loading-state";
import { ApiError } from "../../../lib/api-client";
import { formatMoney, formatNumber, formatWeek } from "../../../lib/format";
import { useCreateLiftTest } from "../api/create-lift-test";
import { useDeleteLiftTest } from "../api/delete-lift-test";
import { useDataset } from "../api/get-dataset";
import { useLiftTests } from "../api/get-lift-tests";
import { uploadLiftTestsInput, useUploadLiftTests } from "../api/upload-lift-tests";
import { FileDrop } from "./file-drop";
import { LiftTestForm } from "./lift-test-form";
import { ValidationReport } from "./validation-report";

function messageOf(error: unknown): string {
  if (error instanceof ApiError) {
    const more = error.issues.map((issue) => issue.message).filter((message) => message !== error.message).slice(0, 5);
    return [error.message, ...more].join(" ");
  }
  return error instanceof Error ? error.message : "Something went wrong.";
}

function LiftTestTable({ datasetId, tests, currency }: { datasetId: string; tests: LiftTestRecord[]; currency: string }) {
  const remove = useDeleteLiftTest(datasetId);
  const [confirming, setConfirming] = useState<string | null>(null);
  const columns: DataTableColumn<LiftTestRecord>[] = [
    { id: "brand", header: "Brand", value: (row) => row.brand },
    { id: "market", header: "Market", value: (row) => row.market },
    { id: "channel", header: "Channel", value: (row) => row.channel },
    { id: "firstWeek", header: "First week", value: (row) => row.firstWeek, cell: (row) => formatWeek(row.firstWeek) },
    { id: "lastWeek", header: "Last week", value: (row) => row.lastWeek, cell: (row) => formatWeek(row.lastWeek) },
    { id: "spend", header: `Spend (${currency})`, value: (row) => row.spend, cell: (row) => formatMoney(row.spend, currency), align: "end" },
    { id: "lift", header: "Extra outcome", value: (row) => row.incrementalOutcome, cell: (row) => formatNumber(row.incrementalOutcome, 4), align: "end" },
    { id: "se", header: "Standard error", value: (row) => row.standardError, cell: (row) => formatNumber(row.standardError, 4), align: "end" },
    { id: "note", header: "Note", value: (row) => row.note ?? null },
    {
      id: "actions",
      header: "Actions",
      value: () => null,
      sortable: false,
      cell: (row) =>
        confirming === row.id ? (
          <span className="inline-flex items-center gap-2">
            <span className="text-caption text-ink-700">Delete?</span>
            <Button
              variant="secondary"
              className="px-2! py-1!"
              disabled={remove.isPending}
              onClick={() => remove.mutate({ liftTestId: row.id }, { onSettled: () => setConfirming(null) })}
            >
              Yes, delete
            </Button>
            <Button variant="quiet" className="px-2! py-1!" onClick={() => setConfirming(null)}>
              Keep
            </Button>
          </span>
        ) : (
          <Button
            variant="quiet"
            className="px-2! py-1!"
            aria-label={`Delete the lift test of ${row.channel} in ${row.brand} ${row.market} from ${row.firstWeek}`}
            onClick={() => setConfirming(row.id)}
          >
            Delete
          </Button>
        ),
    },
  ];
  return (
    <div className="space-y-2">
      {remove.isError ? (
        <p role="alert" className="rounded-md bg-alert-100 px-3 py-2 text-small text-alert-700">
          {messageOf(remove.error)}
        </p>
      ) : null}
      <DataTable
        caption="Recorded lift tests"
        rows={tests}
        columns={columns}
        rowKey={(row) => row.id}
        csvFileName="lift-tests.csv"
        initialSort={{ id: "firstWeek" }}
        emptyMessage="No lift tests recorded for this dataset version yet."
      />
    </div>
  );
}

function LiftTestsFor({ datasetId, currency }: { datasetId: string; currency: string }) {
  const dataset = useDataset(datasetId);
  const tests = useLiftTests(datasetId);
  const create = useCreateLiftTest(datasetId);
  const upload = useUploadLiftTests(datasetId);
  const [fileProblem, setFileProblem] = useState<string | null>(null);
  const [warnings, setWarnings] = useState<Report | null>(null);

  if (dataset.isPending || tests.isPending) return <LoadingState label="Loading lift tests…" />;
  if (dataset.isError) return <ErrorState message={messageOf(dataset.error)} onRetry={() => void dataset.refetch()} />;
  if (tests.isError) return <ErrorState message={messageOf(tests.error)} onRetry={() => void tests.refetch()} />;

  function sendFile(file: File) {
    const parsed = uploadLiftTestsInput.safeParse({ file });
    if (!parsed.success) {
      setFileProblem(parsed.error.issues[0]?.message ?? "This file cannot be used");
      return;
    }
    setFileProblem(null);
    upload.mutate(parsed.data, { onSuccess: (created) => setWarnings(created.report.warningCount > 0 ? created.report : null) });
  }

  return (
    <div className="space-y-6">
      <LiftTestTable datasetId={datasetId} tests={tests.data} currency={currency} />
      {warnings ? <ValidationReport report={warnings} /> : null}
      <div className="grid gap-6 lg:grid-cols-[2fr_1fr]">
        <section aria-labelledby="lift-form-title" className="rounded-lg border border-line p-4">
          <h3 id="lift-form-title" className="mb-3 text-body font-semibold text-ink-900">
            Enter a lift test
          </h3>
          <LiftTestForm
            cells={dataset.data.cells}
            channels={dataset.data.channels}
            currency={currency}
            onSubmit={(input) =>
              create.mutateAsync(input).then((created) => setWarnings(created.report.warningCount > 0 ? created.report : null))
            }
          />
        </section>
        <section aria-labelledby="lift-upload-title" className="rounded-lg border border-line p-4">
          <h3 id="lift-upload-title" className="mb-3 text-body font-semibold text-ink-900">
            Or upload a CSV of lift tests
          </h3>
          <FileDrop
            label="CSV file of lift tests"
            hint="Columns: brand, market, channel, first_week, last_week, spend, incremental_outcome, standard_error, note (optional). All rows are saved, or none."
            onFile={sendFile}
            disabled={upload.isPending}
          />
          {upload.isPending ? <LoadingState label="Reading the lift tests…" /> : null}
          {upload.isSuccess ? (
            <p role="status" className="mt-2 text-small text-ok-700">
              Added {upload.data.created.length} lift {upload.data.created.length === 1 ? "test" : "tests"}.
            </p>
          ) : null}
          {fileProblem || upload.isError ? (
            <p role="alert" className="mt-2 rounded-md bg-alert-100 px-3 py-2 text-small text-alert-700">
              {fileProblem ?? messageOf(upload.error)}
            </p>
          ) : null}
        </section>
      </div>
    </div>
  );
}

/** Lift tests of a chosen dataset version: the list, a form and a CSV upload. */
export function LiftTestsPanel({ versions, currency }: { versions: DatasetVersion[]; currency: string }) {
  const selectId = useId();
  const latest = versions.find((version) => version.latest) ?? versions[0];
  const [chosen, setChosen] = useState<string | null>(null);
  const datasetId = chosen && versions.some((version) => version.id === chosen) ? chosen : (latest?.id ?? null);

  return (
    <section aria-labelledby="lift-tests-title" className="rounded-lg border border-line bg-surface p-5 shadow-card">
      <div className="mb-4 flex flex-wrap items-end justify-between gap-3">
        <div className="max-w-2xl">
          <h2 id="lift-tests-title" className="text-heading font-semibold text-ink-900">
            Lift tests
          </h2>
          <p className="mt-1 text-small text-ink-700">
            Controlled experiments on one channel in one cell. A fit uses them to tie the channel's effect to what the experiment measured.
          </p>
        </div>
        {versions.length > 0 ? (
          <div>
            <label htmlFor={selectId} className="block text-small font-medium text-ink-800">
              Dataset version
            </label>
            <select id={selectId} className={`${inputClass} mt-1 w-64`} value={datasetId ?? ""} onChange={(event) => setChosen(event.target.value)}>
              {versions.map((version) => (
                <option key={version.id} value={version.id}>
                  Version {version.number}
                  {version.latest ? " (latest)" : ""} · {version.fileName}
                </option>
              ))}
            </select>
          </div>
        ) : null}
      </div>
      {datasetId ? (
        <LiftTestsFor key={datasetId} datasetId={datasetId} currency={currency} />
      ) : (
        <p className="text-small text-ink-700">Lift tests are recorded against a dataset version; save one first.</p>
      )}
    </section>
  );
}
