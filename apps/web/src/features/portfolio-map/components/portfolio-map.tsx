import type { Cell, Portfolio } from "@tributary/contracts";
import { DataTable, type DataTableColumn } from "../../../components/data-table/data-table";
import { EmptyState } from "../../../components/ui/empty-state";
import { PageHeader } from "../../../components/ui/page-header";
import { formatWeek } from "../../../lib/format";
import { ChannelList } from "./channel-list";
import { PortfolioGrid } from "./portfolio-grid";

type CellRow = Cell & { brandName: string; marketName: string };

const cellColumns: DataTableColumn<CellRow>[] = [
  { id: "brand", header: "Brand", value: (row) => row.brandName },
  { id: "market", header: "Market", value: (row) => row.marketName },
  { id: "weeks", header: "Weeks of data", value: (row) => row.weeks, align: "end" },
  { id: "firstWeek", header: "First week", value: (row) => row.firstWeek, cell: (row) => (row.firstWeek ? formatWeek(row.firstWeek) : "–") },
  { id: "lastWeek", header: "Last week", value: (row) => row.lastWeek, cell: (row) => (row.lastWeek ? formatWeek(row.lastWeek) : "–") },
];

type PortfolioMapProps = { portfolio: Portfolio; scopedToMarkets: boolean };

export function PortfolioMap({ portfolio, scopedToMarkets }: PortfolioMapProps) {
  const brandName = new Map(portfolio.brands.map((brand) => [brand.id, brand.name]));
  const marketName = new Map(portfolio.markets.map((market) => [market.id, market.name]));
  const rows: CellRow[] = portfolio.cells.map((cell) => ({
    ...cell,
    brandName: brandName.get(cell.brandId) ?? cell.brandId,
    marketName: marketName.get(cell.marketId) ?? cell.marketId,
  }));
  const hasData = portfolio.cells.some((cell) => cell.weeks > 0);

  return (
    <>
      <PageHeader
        eyebrow={portfolio.company}
        title="Portfolio map"
        description={
          <>
            Every brand in every market{scopedToMarkets ? " you look after" : ""}, with how much weekly data each
            holds. Reporting currency: {portfolio.currency}.
          </>
        }
      />
      {scopedToMarkets ? (
        <p className="mb-4 text-small text-ink-700">
          Showing your markets only: {portfolio.markets.map((market) => market.name).join(", ") || "none assigned yet"}.
        </p>
      ) : null}
      {portfolio.brands.length === 0 || portfolio.markets.length === 0 ? (
        <EmptyState title="No brands or markets yet">
          {scopedToMarkets
            ? "No markets are assigned to you yet. Ask an admin to add your markets."
            : "The portfolio has no brands or markets yet. An admin sets them up."}
        </EmptyState>
      ) : (
        <div className="space-y-6">
          <ChannelList channels={portfolio.channels} />
          {!hasData ? (
            <EmptyState title="No data uploaded yet">
              Once an analyst saves a dataset version in Data intake, each cell shows how many weeks of data it holds.
            </EmptyState>
          ) : null}
          <PortfolioGrid portfolio={portfolio} />
          <EmptyState title="No published fit yet" compact>
            Cost per new customer with its interval, the chance each cell is profitable and how far pooling moved the
            estimate will appear in these cells once an analyst publishes a fit.
          </EmptyState>
          <DataTable
            caption="Cells"
            rows={rows}
            columns={cellColumns}
            rowKey={(row) => row.id}
            csvFileName="portfolio-cells.csv"
            initialSort={{ id: "brand" }}
            emptyMessage="No cells in this portfolio yet."
          />
        </div>
      )}
    </>
  );
}
