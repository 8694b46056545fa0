import type { Flag, MarketDesk } from "@tributary/contracts";
import { DataTable, type DataTableColumn } from "../../../components/data-table/data-table";
import { FlagBadge } from "../../../components/estimate/flag-badge";
import { ShrinkageMark } from "../../../components/estimate/shrinkage-mark";
import { formatCac, formatChance, formatMoney } from "../../../lib/format";
import { marketDeskCsvHref } from "../api/get-market-desk";

type DeskCell = MarketDesk["cells"][number];
type Row = DeskCell["channels"][number] & { cellId: string; brand: string; market: string; customerValue: number | null };

const money = (value: number | null | undefined) => (value === null || value === undefined ? null : Number(value.toPrecision(4)));

function columns(currency: string, flagsById: Map<string, Flag>, oneMarket: boolean): DataTableColumn<Row>[] {
  return [
    { id: "brand", header: "Brand", value: (row) => row.brand },
    // With one market shown, the market is in the table's title (and still in the export).
    { id: "market", header: "Market", value: (row) => row.market, csvOnly: oneMarket },
    { id: "channel", header: "Channel", value: (row) => row.channelName, cell: (row) => <span className="whitespace-nowrap">{row.channelName}</span> },
    { id: "median", header: "Median CAC", value: (row) => (row.hasSpend ? money(row.cac.q50) : null), cell: (row) => (row.hasSpend ? formatCac(row.cac.q50, currency) : "no spend"), align: "end" },
    {
      id: "interval",
      header: "90 % interval",
      value: (row) => (row.hasSpend ? `${money(row.cac.q05)}–${money(row.cac.q95)}` : null),
      cell: (row) => (row.hasSpend ? <span className="whitespace-nowrap">{`${formatCac(row.cac.q05, currency)}–${formatCac(row.cac.q95, currency)}`}</span> : "–"),
      align: "end",
      sortable: false,
    },
    { id: "average", header: "Recent avg. CAC", value: (row) => money(row.cacAverage?.q50), cell: (row) => (row.cacAverage ? formatCac(row.cacAverage.q50, currency) : "–"), align: "end" },
    { id: "spend", header: "Spend a week", value: (row) => Math.round(row.currentWeeklySpend), cell: (row) => formatMoney(row.currentWeeklySpend, currency), align: "end" },
    {
      id: "profit",
      header: "Chance of profit",
      value: (row) => (row.probabilityProfitable === null ? null : Number(row.probabilityProfitable.toFixed(3))),
      cell: (row) => formatChance(row.probabilityProfitable),
      align: "end",
    },
    {
      id: "shrinkage",
      header: "Shrinkage",
      value: (row) => (row.pooling.shrinkage === null ? null : Number(row.pooling.shrinkage.toFixed(3))),
      cell: (row) => <ShrinkageMark shrinkage={row.pooling.shrinkage} withValue />,
      align: "end",
    },
    {
      id: "flags",
      header: "Flags",
      value: (row) => row.flagIds.map((id) => flagsById.get(id)?.kind).filter(Boolean).join("; ") || null,
      cell: (row) => (
        <span className="flex gap-1">
          {row.flagIds.map((id) => flagsById.get(id)).map((flag) => (flag ? <FlagBadge key={flag.id} kind={flag.kind} compact /> : null))}
        </span>
      ),
      sortable: false,
    },
  ];
}

type EstimatesTableProps = { desk: MarketDesk; marketId: string | null; marketNames: string; flagsById: Map<string, Flag> };

export function EstimatesTable({ desk, marketId, marketNames, flagsById }: EstimatesTableProps) {
  const rows: Row[] = desk.cells.flatMap((cell) =>
    cell.channels.map((channel) => ({ ...channel, cellId: cell.cellId, brand: cell.brand, market: cell.market, customerValue: cell.customerValue })),
  );
  return (
    <DataTable
      caption={`Brands × channels in ${marketNames}`}
      rows={rows}
      columns={columns(desk.currency, flagsById, new Set(desk.cells.map((cell) => cell.marketId)).size <= 1)}
      rowKey={(row) => `${row.cellId}|${row.channel}`}
      csvFileName="market-desk-estimates.csv"
      csvHref={marketDeskCsvHref("estimates", marketId)}
      initialSort={{ id: "brand" }}
      pageSize={20}
      compact
    />
  );
}
