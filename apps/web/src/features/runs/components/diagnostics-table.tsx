import type { ParameterDiagnostic } from "@tributary/contracts";
import { DataTable, type DataTableColumn } from "../../../components/data-table/data-table";
import { formatNumber } from "../../../lib/format";

const RHAT_LIMIT = 1.01;
const ESS_LIMIT = 400;
const round = (value: number | null, digits: number) => (value !== null && Number.isFinite(value) ? Number(value.toPrecision(digits)) : null);

function Flagged({ text, flagged, why }: { text: string; flagged: boolean; why: string }) {
  if (!flagged) return <>{text}</>;
  return (
    <span className="inline-flex items-center gap-1 font-semibold text-caution-700">
      <svg viewBox="0 0 10 10" className="h-2.5 w-2.5" aria-hidden="true">
        <path d="M5 0.8 9.4 9H0.6Z" fill="currentColor" />
      </svg>
      {text}
      <span className="sr-only"> ({why})</span>
    </span>
  );
}

const columns: DataTableColumn<ParameterDiagnostic>[] = [
  {
    id: "label",
    header: "Parameter",
    value: (row) => row.label,
    cell: (row) => (
      <span className="block min-w-48">
        {row.label}
        <code className="block font-mono text-caption text-ink-600">{row.name}</code>
      </span>
    ),
  },
  { id: "name", header: "Name in the model", value: (row) => row.name, csvOnly: true },
  { id: "mean", header: "Mean", value: (row) => round(row.mean, 4), cell: (row) => formatNumber(row.mean, 4), align: "end" },
  { id: "sd", header: "SD", value: (row) => round(row.sd, 3), cell: (row) => formatNumber(row.sd, 3), align: "end" },
  { id: "q50", header: "Median", value: (row) => round(row.q50, 4), cell: (row) => formatNumber(row.q50, 4), align: "end" },
  {
    id: "interval",
    header: "90 % interval",
    value: (row) => round(row.q95 - row.q05, 4),
    cell: (row) => (
      <span className="whitespace-nowrap">
        {formatNumber(row.q05, 3)} to {formatNumber(row.q95, 3)}
      </span>
    ),
    align: "end",
  },
  { id: "q05", header: "5 %", value: (row) => round(row.q05, 6), csvOnly: true },
  { id: "q95", header: "95 %", value: (row) => round(row.q95, 6), csvOnly: true },
  {
    id: "rhat",
    header: "R-hat",
    value: (row) => round(row.rhat, 5),
    cell: (row) => <Flagged text={formatNumber(row.rhat, 4)} flagged={row.rhat !== null && !(row.rhat <= RHAT_LIMIT)} why={`above ${RHAT_LIMIT}`} />,
    align: "end",
  },
  {
    id: "essBulk",
    header: "Bulk ESS",
    value: (row) => (row.essBulk === null ? null : Math.round(row.essBulk)),
    cell: (row) => <Flagged text={row.essBulk === null ? "–" : String(Math.round(row.essBulk))} flagged={row.essBulk !== null && !(row.essBulk >= ESS_LIMIT)} why={`below ${ESS_LIMIT}`} />,
    align: "end",
  },
  { id: "essTail", header: "Tail ESS", value: (row) => (row.essTail === null ? null : Math.round(row.essTail)), align: "end" },
  { id: "mcse", header: "MCSE (mean)", value: (row) => round(row.mcseMean, 3), cell: (row) => formatNumber(row.mcseMean, 3), align: "end" },
];

/** Every parameter's posterior summary and convergence numbers; worst R-hat first. */
export function DiagnosticsTable({ parameters }: { parameters: ParameterDiagnostic[] }) {
  return (
    <DataTable
      caption="Diagnostics per parameter"
      rows={parameters}
      columns={columns}
      rowKey={(row) => row.name}
      csvFileName="run-diagnostics.csv"
      initialSort={{ id: "rhat", desc: true }}
      pageSize={20}
      compact
      emptyMessage="This run has no parameter summaries."
    />
  );
}
