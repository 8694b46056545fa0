import type { Brand, Cell, Portfolio } from "@tributary/contracts";
import { useId, useState } from "react";
import { DataTable, type DataTableColumn } from "../../../components/data-table/data-table";
import { EmptyState } from "../../../components/ui/empty-state";
import { PageHeader } from "../../../components/ui/page-header";
import { formatWeek } from "../../../lib/format";

type BrandRow = { brand: Brand; cell: Cell | undefined };

const brandColumns: DataTableColumn<BrandRow>[] = [
  { id: "brand", header: "Brand", value: (row) => row.brand.name },
  { id: "weeks", header: "Weeks of data", value: (row) => (row.cell && row.cell.weeks > 0 ? row.cell.weeks : null), align: "end" },
  {
    id: "firstWeek",
    header: "First week",
    value: (row) => row.cell?.firstWeek ?? null,
    cell: (row) => (row.cell?.firstWeek ? formatWeek(row.cell.firstWeek) : "No data"),
  },
  {
    id: "lastWeek",
    header: "Last week",
    value: (row) => row.cell?.lastWeek ?? null,
    cell: (row) => (row.cell?.lastWeek ? formatWeek(row.cell.lastWeek) : "No data"),
  },
];

type MarketDeskProps = { portfolio: Portfolio; userName: string; scopedToMarkets: boolean };

export function MarketDesk({ portfolio, userName, scopedToMarkets }: MarketDeskProps) {
  const pickerId = useId();
  const [marketId, setMarketId] = useState(portfolio.markets[0]?.id ?? "");
  const market = portfolio.markets.find((candidate) => candidate.id === marketId) ?? portfolio.markets[0];

  const header = (
    <PageHeader
      eyebrow={`Welcome, ${userName}`}
      title="Market desk"
      description={
        scopedToMarkets
          ? "Your markets: each brand's data, the latest published fit and your saved spend plans."
          : "One market at a time: each brand's data, the latest published fit and saved spend plans."
      }
    />
  );

  if (!market) {
    return (
      <>
        {header}
        <EmptyState title="No markets yet">
          {scopedToMarkets
            ? "No markets are assigned to you yet. Ask an admin to add your markets."
            : "The portfolio has no markets yet."}
        </EmptyState>
      </>
    );
  }

  const rows: BrandRow[] = portfolio.brands.map((brand) => ({
    brand,
    cell: portfolio.cells.find((cell) => cell.brandId === brand.id && cell.marketId === market.id),
  }));

  return (
    <>
      {header}
      <div className="mb-6 flex flex-wrap items-center gap-3">
        {portfolio.markets.length > 1 ? (
          <>
            <label htmlFor={pickerId} className="text-small font-medium text-ink-800">
              Market
            </label>
            <select
              id={pickerId}
              value={market.id}
              onChange={(event) => setMarketId(event.target.value)}
              className="rounded-md border border-field bg-surface px-3 py-1.5 text-body text-ink-900"
            >
              {portfolio.markets.map((option) => (
                <option key={option.id} value={option.id}>
                  {option.name}
                </option>
              ))}
            </select>
          </>
        ) : null}
        <p className="text-small text-ink-700">
          {scopedToMarkets ? `You look after ${portfolio.markets.map((m) => m.name).join(", ")}.` : null}
        </p>
      </div>
      <div className="space-y-6">
        <DataTable
          caption={`Brands in ${market.name}`}
          rows={rows}
          columns={brandColumns}
          rowKey={(row) => row.brand.id}
          csvFileName={`market-desk-${market.code.toLowerCase()}.csv`}
          initialSort={{ id: "brand" }}
          emptyMessage="No brands in this portfolio yet."
        />
        <div className="grid gap-6 lg:grid-cols-2">
          <EmptyState title="No published fit yet">
            Cost per new customer for each brand and channel in {market.name}, with intervals, appears here once an
            analyst publishes a fit.
          </EmptyState>
          <EmptyState title="No saved spend plans yet">
            Spend scenarios saved in the Spend planner for {market.name} will be listed here.
          </EmptyState>
        </div>
      </div>
    </>
  );
}
