import type { MarketDesk } from "@tributary/contracts";
import { DataTable, type DataTableColumn } from "../../../components/data-table/data-table";
import { formatCac } from "../../../lib/format";
import { marketDeskCsvHref } from "../api/get-market-desk";

type Change = MarketDesk["changes"][number];

const statusLabels: Record<Change["status"], string> = { compared: "in both fits", new: "new in this fit", dropped: "no longer in the fit" };
const money = (value: number | null | undefined) => (value === null || value === undefined ? null : Number(value.toPrecision(4)));

function side(value: Change["before"], currency: string): string {
  return value ? `${formatCac(value.q50, currency)} (${formatCac(value.q05, currency)}–${formatCac(value.q95, currency)})` : "–";
}

function columns(currency: string): DataTableColumn<Change>[] {
  return [
    { id: "brand", header: "Brand", value: (row) => row.brand },
    { id: "market", header: "Market", value: (row) => row.market },
    { id: "channel", header: "Channel", value: (row) => row.channelName },
    { id: "before", header: "Before", value: (row) => money(row.before?.q50), cell: (row) => <span className="whitespace-nowrap">{side(row.before, currency)}</span>, align: "end" },
    { id: "after", header: "Now", value: (row) => money(row.after?.q50), cell: (row) => <span className="whitespace-nowrap">{side(row.after, currency)}</span>, align: "end" },
    {
      id: "change",
      header: "Median change",
      value: (row) => (row.medianChange === null ? null : Number(row.medianChange.toFixed(4))),
      cell: (row) =>
        row.medianChange === null ? (
          <span className="text-ink-600">{statusLabels[row.status]}</span>
        ) : (
          <span className={row.intervalsOverlap === false ? "font-semibold text-caution-700" : ""}>
            {row.medianChange > 0 ? "+" : row.medianChange < 0 ? "−" : ""}
            {Math.abs(Math.round(row.medianChange * 100))} % {row.medianChange > 0 ? "dearer" : row.medianChange < 0 ? "cheaper" : ""}
          </span>
        ),
      align: "end",
    },
    {
      id: "beyond",
      header: "Beyond the uncertainty",
      value: (row) => (row.intervalsOverlap === null ? null : row.intervalsOverlap ? "no" : "yes"),
      cell: (row) => (row.intervalsOverlap === null ? "–" : row.intervalsOverlap ? "no, intervals overlap" : <strong className="font-semibold text-caution-700">yes</strong>),
    },
    { id: "q05before", header: "Before 5 %", value: (row) => money(row.before?.q05), csvOnly: true },
    { id: "q95before", header: "Before 95 %", value: (row) => money(row.before?.q95), csvOnly: true },
    { id: "q05after", header: "Now 5 %", value: (row) => money(row.after?.q05), csvOnly: true },
    { id: "q95after", header: "Now 95 %", value: (row) => money(row.after?.q95), csvOnly: true },
  ];
}

export function ChangesTable({ desk, marketId }: { desk: MarketDesk; marketId: string | null }) {
  return (
    <DataTable
      caption="Changes since the previous fit"
      rows={desk.changes}
      columns={columns(desk.currency)}
      rowKey={(row) => `${row.cellId}|${row.channel}`}
      csvFileName="market-desk-changes.csv"
      csvHref={marketDeskCsvHref("changes", marketId)}
      emptyMessage="Nothing changed between the two fits in these markets."
      pageSize={15}
      compact
    />
  );
}
