import type { HoldoutAccuracy as Accuracy } from "@tributary/contracts";
import { DataTable, type DataTableColumn } from "../../../components/data-table/data-table";
import { formatNumber } from "../../../lib/format";

type CellAccuracy = Accuracy["cells"][number];
const percent = (share: number) => `${formatNumber(share * 100, 3)} %`;

const columns: DataTableColumn<CellAccuracy>[] = [
  { id: "cell", header: "Cell", value: (row) => `${row.brand} in ${row.market}` },
  { id: "crps", header: "CRPS (outcome units, lower is better)", value: (row) => Number(row.crps.toPrecision(4)), align: "end" },
  { id: "mape", header: "Median forecast error (MAPE)", value: (row) => (row.mape === null ? null : Number(row.mape.toFixed(2))), cell: (row) => (row.mape === null ? "–" : `${formatNumber(row.mape, 3)} %`), align: "end" },
  { id: "coverage", header: "Held-out weeks inside the 90 % band", value: (row) => Number(row.coverage90.toFixed(4)), cell: (row) => percent(row.coverage90), align: "end" },
];

/** How well the fit forecast the weeks it did not see. */
export function HoldoutAccuracy({ holdout, holdoutWeeks }: { holdout: Accuracy | null; holdoutWeeks: number }) {
  if (!holdout) {
    return (
      <p className="text-small text-ink-700">
        {holdoutWeeks === 0
          ? "No weeks were held out (holdout weeks was 0 in this run's settings), so there is no forecast to score. Set holdout weeks in Model setup to measure it."
          : "This run has no holdout score."}
      </p>
    );
  }
  return (
    <div className="space-y-4">
      <dl className="grid grid-cols-2 gap-4 text-small md:grid-cols-4">
        <div className="rounded-md border border-line p-3">
          <dt className="text-ink-600">Held-out weeks per cell</dt>
          <dd className="text-heading font-semibold text-ink-900">{holdout.weeks}</dd>
        </div>
        <div className="rounded-md border border-line p-3">
          <dt className="text-ink-600">Mean CRPS (lower is better)</dt>
          <dd className="text-heading font-semibold text-ink-900">{formatNumber(holdout.crps, 4)}</dd>
        </div>
        <div className="rounded-md border border-line p-3">
          <dt className="text-ink-600">Median forecast error (MAPE)</dt>
          <dd className="text-heading font-semibold text-ink-900">{holdout.mape === null ? "–" : `${formatNumber(holdout.mape, 3)} %`}</dd>
        </div>
        <div className="rounded-md border border-line p-3">
          <dt className="text-ink-600">Inside the 90 % band</dt>
          <dd className="text-heading font-semibold text-ink-900">{percent(holdout.coverage90)}</dd>
        </div>
      </dl>
      <p className="text-caption text-ink-600">
        CRPS scores the whole forecast distribution against what happened, in the outcome's own units; MAPE scores only the median forecast. About 90 % of held-out weeks inside the 90 % band means the intervals are honest.
      </p>
      <DataTable caption="Holdout accuracy per cell" rows={holdout.cells} columns={columns} rowKey={(row) => row.cellId} csvFileName="holdout-accuracy.csv" initialSort={{ id: "crps", desc: true }} />
    </div>
  );
}
