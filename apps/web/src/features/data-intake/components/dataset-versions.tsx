import type { DatasetVersion } from "@tributary/contracts";
import { DataTable, type DataTableColumn } from "../../../components/data-table/data-table";
import { EmptyState } from "../../../components/ui/empty-state";
import { formatDateTime, formatWeekRange } from "../../../lib/format";

const columns: DataTableColumn<DatasetVersion>[] = [
  {
    id: "number",
    header: "Version",
    value: (row) => row.number,
    cell: (row) => (
      <span className="inline-flex items-center gap-2 font-semibold">
        {row.number}
        {row.latest ? <span className="rounded-sm bg-stream-100 px-1.5 text-caption font-semibold text-stream-800">latest</span> : null}
      </span>
    ),
  },
  { id: "createdAt", header: "Saved", value: (row) => row.createdAt, cell: (row) => formatDateTime(row.createdAt) },
  { id: "createdBy", header: "By", value: (row) => row.createdBy?.name ?? null },
  { id: "fileName", header: "File", value: (row) => row.fileName },
  { id: "note", header: "Note", value: (row) => row.note },
  { id: "rows", header: "Rows", value: (row) => row.rows, cell: (row) => row.rows.toLocaleString("en-GB"), align: "end" },
  { id: "cells", header: "Cells", value: (row) => row.cellCount, align: "end" },
  { id: "weeks", header: "Weeks", value: (row) => formatWeekRange(row.firstWeek, row.lastWeek) },
  { id: "channels", header: "Channels", value: (row) => row.channels.join(", ") },
  { id: "warnings", header: "Warnings", value: (row) => row.warningCount, align: "end" },
];

export function DatasetVersions({ versions }: { versions: DatasetVersion[] }) {
  if (versions.length === 0) {
    return (
      <EmptyState title="No dataset versions yet">
        Upload a CSV above and save it; each save becomes a version that never changes, so every fit can be traced to the exact
        data behind it.
      </EmptyState>
    );
  }
  return (
    <DataTable
      caption="Dataset versions"
      rows={versions}
      columns={columns}
      rowKey={(row) => row.id}
      csvFileName="dataset-versions.csv"
      initialSort={{ id: "number", desc: true }}
    />
  );
}
