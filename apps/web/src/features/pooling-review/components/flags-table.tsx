import { flagKindLabels, type Flag } from "@tributary/contracts";
import { DataTable, type DataTableColumn } from "../../../components/data-table/data-table";
import { FlagBadge } from "../../../components/estimate/flag-badge";
import { Button } from "../../../components/ui/button";
import { ErrorState } from "../../../components/ui/error-state";
import { LoadingState } from "../../../components/ui/loading-state";
import { formatDateTime } from "../../../lib/format";
import { useClearFlag } from "../api/clear-flag";
import { flagsCsvHref, useFlags } from "../api/get-flags";

/** Every flag with who raised it and when; active ones can be cleared (they stay in the list). */
export function FlagsTable() {
  const flags = useFlags();
  const clear = useClearFlag();
  if (flags.isPending) return <LoadingState label="Loading flags…" />;
  if (flags.isError) return <ErrorState title="Flags could not be loaded" message={flags.error.message} onRetry={() => void flags.refetch()} />;

  const columns: DataTableColumn<Flag>[] = [
    { id: "cell", header: "Cell", value: (row) => `${row.brand} · ${row.market}` },
    { id: "channel", header: "Channel", value: (row) => row.channelName },
    { id: "kind", header: "Flag", value: (row) => flagKindLabels[row.kind], cell: (row) => <FlagBadge kind={row.kind} /> },
    { id: "note", header: "Note", value: (row) => row.note, cell: (row) => <span className="block max-w-xs whitespace-pre-line">{row.note}</span> },
    { id: "by", header: "Flagged by", value: (row) => row.createdBy?.name ?? null },
    { id: "at", header: "When", value: (row) => row.createdAt, cell: (row) => formatDateTime(row.createdAt) },
    {
      id: "status",
      header: "Status",
      value: (row) => (row.active ? "active" : "cleared"),
      cell: (row) =>
        row.active ? (
          <Button variant="quiet" className="px-2! py-0.5!" disabled={clear.isPending} onClick={() => clear.mutate({ flagId: row.id })} aria-label={`Clear the flag on ${row.brand} · ${row.market} · ${row.channelName}`}>
            Clear
          </Button>
        ) : (
          <span className="text-caption text-ink-600">
            cleared{row.clearedBy ? ` by ${row.clearedBy.name}` : ""}
            {row.clearedAt ? `, ${formatDateTime(row.clearedAt)}` : ""}
          </span>
        ),
    },
  ];
  return (
    <div className="space-y-2">
      {clear.isError ? (
        <p role="alert" className="rounded-md bg-alert-100 px-3 py-2 text-small text-alert-700">
          The flag could not be cleared: {clear.error.message}
        </p>
      ) : null}
      <DataTable
        caption="Flags"
        rows={flags.data}
        columns={columns}
        rowKey={(row) => row.id}
        csvFileName="flags.csv"
        csvHref={flagsCsvHref}
        initialSort={{ id: "at", desc: true }}
        emptyMessage="No estimate has been flagged yet."
        pageSize={15}
        compact
      />
    </div>
  );
}
