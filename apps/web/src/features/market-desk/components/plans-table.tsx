import type { MarketDesk } from "@tributary/contracts";
import { DataTable, type DataTableColumn } from "../../../components/data-table/data-table";
import { formatDateTime } from "../../../lib/format";
import { marketDeskCsvHref } from "../api/get-market-desk";

type Plan = MarketDesk["plans"][number];

const kindLabels: Record<Plan["kind"], string> = { scenario: "Spend scenario", budget_split: "Budget split" };
const statusLabels: Record<Plan["status"], string> = { draft: "Draft", submitted: "Waiting for approval", approved: "Approved", rejected: "Not approved" };

const columns: DataTableColumn<Plan>[] = [
  { id: "name", header: "Plan", value: (row) => row.name },
  { id: "kind", header: "Kind", value: (row) => kindLabels[row.kind] },
  { id: "status", header: "Status", value: (row) => statusLabels[row.status] },
  { id: "markets", header: "Markets", value: (row) => row.markets.join(", ") },
  { id: "by", header: "Saved by", value: (row) => (row.mine ? "you" : (row.createdBy?.name ?? null)) },
  { id: "updated", header: "Last changed", value: (row) => row.updatedAt, cell: (row) => formatDateTime(row.updatedAt) },
];

export function PlansTable({ desk, marketId }: { desk: MarketDesk; marketId: string | null }) {
  return (
    <DataTable
      caption="Spend plans"
      rows={desk.plans}
      columns={columns}
      rowKey={(row) => row.id}
      csvFileName="market-desk-plans.csv"
      csvHref={marketDeskCsvHref("plans", marketId)}
      initialSort={{ id: "updated", desc: true }}
      compact
    />
  );
}
