import type { Flag, Portfolio, PortfolioMap as PortfolioMapData, PortfolioMapCell } from "@tributary/contracts";
import { useId, type ReactNode } from "react";
import { useSearchParams } from "react-router-dom";
import { DataTable, type DataTableColumn } from "../../../components/data-table/data-table";
import { EstimateKey } from "../../../components/estimate/estimate-key";
import { FlagBadge } from "../../../components/estimate/flag-badge";
import { ShrinkageMark } from "../../../components/estimate/shrinkage-mark";
import { RunStamp } from "../../../components/results/run-stamp";
import { EmptyState } from "../../../components/ui/empty-state";
import { ErrorState } from "../../../components/ui/error-state";
import { inputClass } from "../../../components/ui/field";
import { LoadingState } from "../../../components/ui/loading-state";
import { ModelCaution } from "../../../components/ui/model-caution";
import { PageHeader } from "../../../components/ui/page-header";
import { formatCac, formatChance } from "../../../lib/format";
import { portfolioMapCsvHref, usePortfolioMap } from "../api/get-portfolio-map";
import { EstimateGrid } from "./estimate-grid";
import { PortfolioGrid } from "./portfolio-grid";

type PortfolioMapProps = {
  /** Brands, markets and data lengths: what the screen shows before a run is published. */
  portfolio: Portfolio;
  scopedToMarkets: boolean;
  /** The Channel sheet of one cell × channel. */
  channelSheetHref: (selection: { cellId: string; channel: string }) => string;
  /** Shown instead of estimates while no run is published. */
  noPublishedRun: ReactNode;
};

const ALL = "all";

function flagsOf(cell: PortfolioMapCell, flagsById: Map<string, Flag>): Flag[] {
  return cell.flagIds.map((id) => flagsById.get(id)).filter((flag): flag is Flag => flag !== undefined);
}

function cellColumns(map: PortfolioMapData): DataTableColumn<PortfolioMapCell>[] {
  const flagsById = new Map(map.flags.map((flag) => [flag.id, flag]));
  const money = (value: number | null | undefined) => (value === null || value === undefined ? null : Number(value.toPrecision(4)));
  return [
    { id: "brand", header: "Brand", value: (row) => row.brand },
    // With one market, the market is in every row of the grid above (and still in the export).
    { id: "market", header: "Market", value: (row) => row.market, csvOnly: map.markets.length === 1 },
    { id: "weeks", header: "Weeks", value: (row) => row.weeks, align: "end" },
    { id: "median", header: "Median CAC", value: (row) => money(row.cac?.q50), cell: (row) => (row.cac ? formatCac(row.cac.q50, map.currency) : "no spend"), align: "end" },
    {
      id: "interval",
      header: "90 % interval",
      value: (row) => (row.cac ? `${money(row.cac.q05)}–${money(row.cac.q95)}` : null),
      cell: (row) => (row.cac ? <span className="whitespace-nowrap">{`${formatCac(row.cac.q05, map.currency)}–${formatCac(row.cac.q95, map.currency)}`}</span> : "–"),
      align: "end",
      sortable: false,
    },
    { id: "q05", header: "5 %", value: (row) => money(row.cac?.q05), csvOnly: true },
    { id: "q95", header: "95 %", value: (row) => money(row.cac?.q95), csvOnly: true },
    {
      id: "profit",
      header: "Chance of profit",
      value: (row) => (row.probabilityProfitable === null ? null : Number(row.probabilityProfitable.toFixed(3))),
      cell: (row) => (row.probabilityProfitable === null ? <span className="text-ink-500">–</span> : formatChance(row.probabilityProfitable)),
      align: "end",
    },
    {
      id: "shrinkage",
      header: "Shrinkage",
      value: (row) => (row.pooling.shrinkage === null ? null : Number(row.pooling.shrinkage.toFixed(3))),
      cell: (row) => <ShrinkageMark shrinkage={row.pooling.shrinkage} withValue />,
      align: "end",
    },
    ...(map.channel === null
      ? [
          {
            id: "moveChannel",
            header: "Moved most on",
            value: (row: PortfolioMapCell) => (row.moveChannel ? (map.channels.find((channel) => channel.code === row.moveChannel)?.name ?? row.moveChannel) : null),
          } satisfies DataTableColumn<PortfolioMapCell>,
        ]
      : []),
    {
      id: "flags",
      header: "Flags",
      value: (row) => flagsOf(row, flagsById).map((flag) => `${flag.kind} (${flag.channel})`).join("; ") || null,
      cell: (row) => (
        <span className="flex flex-wrap gap-1">
          {flagsOf(row, flagsById).map((flag) => (
            <FlagBadge key={flag.id} kind={flag.kind} channel={map.channel === null ? flag.channelName : undefined} short />
          ))}
        </span>
      ),
      sortable: false,
    },
    { id: "lastWeek", header: "Last week", value: (row) => row.lastWeek, csvOnly: true },
  ];
}

export function PortfolioMap({ portfolio, scopedToMarkets, channelSheetHref, noPublishedRun }: PortfolioMapProps) {
  const [params, setParams] = useSearchParams();
  const channelParam = params.get("channel");
  const channel = channelParam && channelParam !== ALL ? channelParam : null;
  const query = usePortfolioMap(channel);
  const selectId = useId();
  const map = query.data;

  const header = (
    <PageHeader
      eyebrow={portfolio.company}
      title="Portfolio map"
      description={
        <>
          What a new customer costs in every brand and market{scopedToMarkets ? " you look after" : ""}, how likely each
          cell is to pay for itself, and how far pooling moved its estimate.
        </>
      }
    />
  );

  if (query.isPending) {
    return (
      <>
        {header}
        <LoadingState label="Loading the current fit…" />
      </>
    );
  }
  if (query.isError) {
    return (
      <>
        {header}
        <ErrorState title="The Portfolio map could not be loaded" message={query.error.message} onRetry={() => void query.refetch()} />
      </>
    );
  }
  const scopeNotice = scopedToMarkets ? (
    <p className="mb-4 text-small text-ink-700">
      Showing your markets only: {portfolio.markets.map((market) => market.name).join(", ") || "none assigned yet"}.
    </p>
  ) : null;

  if (!map) {
    return (
      <>
        {header}
        {scopeNotice}
        <div className="space-y-6">
          {noPublishedRun}
          {portfolio.brands.length > 0 && portfolio.markets.length > 0 ? <PortfolioGrid portfolio={portfolio} /> : null}
        </div>
      </>
    );
  }

  const chooseChannel = (value: string) => {
    const next = new URLSearchParams(params);
    if (value === ALL) next.delete("channel");
    else next.set("channel", value);
    setParams(next, { replace: true });
  };
  const linkChannel = (cell: PortfolioMapCell) => map.channel ?? cell.moveChannel ?? map.channels[0]?.code ?? "";
  const channelLabel = map.channel ? (map.channels.find((c) => c.code === map.channel)?.name ?? map.channel) : "All channels combined";

  return (
    <>
      {header}
      <RunStamp run={map.run} />
      {scopeNotice}
      <div className="mb-4 flex flex-wrap items-end justify-between gap-4">
        <div>
          <label htmlFor={selectId} className="block text-small font-medium text-ink-800">
            Channel
          </label>
          <select id={selectId} className={`${inputClass} mt-1 w-64`} value={map.channel ?? ALL} onChange={(event) => chooseChannel(event.target.value)}>
            <option value={ALL}>All channels combined</option>
            {map.channels.map((option) => (
              <option key={option.code} value={option.code}>
                {option.name}
              </option>
            ))}
          </select>
        </div>
        <dl className="max-w-2xl space-y-0.5 text-caption text-ink-700">
          <div>
            <dt className="inline font-semibold text-ink-800">Cost per new customer: </dt>
            <dd className="inline">
              {map.headline.label} ({map.currency}).
            </dd>
          </div>
          <div>
            <dt className="inline font-semibold text-ink-800">Chance of profit: </dt>
            <dd className="inline">the share of posterior draws in which that cost is below the brand’s customer value.</dd>
          </div>
          {map.channel === null ? (
            <div>
              <dt className="inline font-semibold text-ink-800">Shrinkage mark: </dt>
              <dd className="inline">of the channel pooling moved furthest (hover to see which).</dd>
            </div>
          ) : null}
        </dl>
      </div>
      {query.isFetching ? <p className="sr-only" role="status">Loading {channelLabel}…</p> : null}
      {map.brands.length === 0 || map.markets.length === 0 ? (
        <EmptyState title="No brands or markets in this run">
          {scopedToMarkets ? "No markets are assigned to you yet. Ask an admin to add your markets." : "The published run holds no cells."}
        </EmptyState>
      ) : (
        <div className="space-y-5">
          <EstimateGrid map={map} cellHref={(cell) => channelSheetHref({ cellId: cell.cellId, channel: linkChannel(cell) })} />
          <EstimateKey referenceLabel="customer value" />
          <ModelCaution />
          <DataTable
            caption={`Cells: ${channelLabel}`}
            rows={map.cells}
            columns={cellColumns(map)}
            rowKey={(row) => row.cellId}
            csvFileName={`portfolio-map-${map.channel ?? ALL}.csv`}
            csvHref={portfolioMapCsvHref(map.channel)}
            initialSort={{ id: "brand" }}
            emptyMessage="No cells in this run."
            compact
          />
        </div>
      )}
    </>
  );
}
