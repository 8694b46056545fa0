import type { DatasetVersionDetail } from "@tributary/contracts";
import { ErrorState } from "../../../components/ui/error-state";
import { LoadingState } from "../../../components/ui/loading-state";
import { PageHeader } from "../../../components/ui/page-header";
import { exampleCsvFileName, exampleCsvHref } from "../api/example-csv";
import { useDatasets } from "../api/get-datasets";
import { DatasetVersions } from "./dataset-versions";
import { LiftTestsPanel } from "./lift-tests-panel";
import { NewDatasetVersion } from "./new-dataset-version";

type DataIntakeProps = { currency: string; onSaved?: (version: DatasetVersionDetail) => void };

export function DataIntake({ currency, onSaved }: DataIntakeProps) {
  const datasets = useDatasets();
  return (
    <>
      <PageHeader
        title="Data intake"
        description="Bring in the weekly data the model learns from, check it, and keep every version."
        actions={
          <a
            href={exampleCsvHref}
            download={exampleCsvFileName}
            className="inline-flex items-center gap-2 rounded-md border border-field bg-surface px-3.5 py-2 text-small font-medium text-ink-900 hover:bg-ink-50"
          >
            Download the example CSV
          </a>
        }
      />
      <div className="space-y-8">
        <NewDatasetVersion currency={currency} onSaved={onSaved} />
        <section aria-labelledby="versions-title" className="space-y-3">
          <h2 id="versions-title" className="text-heading font-semibold text-ink-900">
            Saved versions
          </h2>
          {datasets.isPending ? (
            <LoadingState label="Loading dataset versions…" />
          ) : datasets.isError ? (
            <ErrorState title="The dataset versions could not be loaded" message={datasets.error.message} onRetry={() => void datasets.refetch()} />
          ) : (
            <DatasetVersions versions={datasets.data} />
          )}
        </section>
        {datasets.isSuccess ? <LiftTestsPanel versions={datasets.data} currency={currency} /> : null}
      </div>
    </>
  );
}
