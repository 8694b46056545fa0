import type { BrandComparison as BrandComparisonData } from "@tributary/contracts";
import { useId, useMemo, type ReactNode } from "react";
import { Link, useSearchParams } from "react-router-dom";
import { DataTable, type DataTableColumn } from "../../../components/data-table/data-table";
import { EstimateKey } from "../../../components/estimate/estimate-key";
import { FlagBadge } from "../../../components/estimate/flag-badge";
import { ShrinkageMark } from "../../../components/estimate/shrinkage-mark";
import { RunStamp } from "../../../components/results/run-stamp";
import { EmptyState } from "../../../components/ui/empty-state";
import { ErrorState } from "../../../components/ui/error-state";
import { inputClass } from "../../../components/ui/field";
import { LoadingState } from "../../../components/ui/loading-state";
import { PageHeader } from "../../../components/ui/page-header";
import { formatCac } from "../../../lib/format";
import { brandComparisonCsvHref, useBrandComparison } from "../api/get-brand-comparison";
import { ChannelComparisonChart } from "./channel-comparison-chart";
import { comparisonLines, comparisonSortLabels, type ComparisonLine, type ComparisonSort } from "./comparison-rows";

type BrandComparisonProps = {
  scopedToMarkets: boolean;
  channelSheetHref: (selection: { cellId: string; channel: string }) => string;
  noPublishedRun: ReactNode;
};

const ALL = "all";
const sorts = Object.keys(comparisonSortLabels) as ComparisonSort[];

type TableRow = ComparisonLine & { channelName: string; portfolioMedian: number };

function tableColumns(currency: string, channelSheetHref: BrandComparisonProps["channelSheetHref"]): DataTableColumn<TableRow>[] {
  const money = (value: number | null) => (value === null ? null : Number(value.toPrecision(4)));
  return [
    { id: "channel", header: "Channel", value: (row) => row.channelName },
    { id: "brand", header: "Brand", value: (row) => row.brand },
    {
      id: "market",
      header: "Market",
      value: (row) => row.market ?? "whole brand",
      cell: (row) =>
        row.cellId && row.market ? (
          <Link className="text-stream-700 underline decoration-stream-200 underline-offset-2 hover:decoration-stream-700" to={channelSheetHref({ cellId: row.cellId, channel: row.channel })}>
            {row.market}
          </Link>
        ) : (
          <span className="italic text-ink-700">whole brand</span>
        ),
    },
    { id: "median", header: "Median CAC", value: (row) => money(row.interval.q50), cell: (row) => formatCac(row.interval.q50, currency), align: "end" },
    {
      id: "interval",
      header: "90 % interval",
      value: (row) => `${money(row.interval.q05)}–${money(row.interval.q95)}`,
      cell: (row) => <span className="whitespace-nowrap">{`${formatCac(row.interval.q05, currency)}–${formatCac(row.interval.q95, currency)}`}</span>,
      align: "end",
      sortable: false,
    },
    { id: "q05", header: "5 %", value: (row) => money(row.interval.q05), csvOnly: true },
    { id: "q95", header: "95 %", value: (row) => money(row.interval.q95), csvOnly: true },
    {
      id: "vsPortfolio",
      header: "Median vs portfolio",
      value: (row) => Number((row.interval.q50 / row.portfolioMedian).toFixed(3)),
      cell: (row) => `${(row.interval.q50 / row.portfolioMedian).toFixed(2)} ×`,
      align: "end",
    },
    {
      id: "shrinkage",
      header: "Shrinkage",
      value: (row) => (row.shrinkage === null ? null : Number(row.shrinkage.toFixed(3))),
      cell: (row) => (row.kind === "cell" ? <ShrinkageMark shrinkage={row.shrinkage} withValue /> : <span className="text-ink-500">–</span>),
      align: "end",
    },
    {
      id: "flags",
      header: "Flags",
      value: (row) => [row.outlier ? "candidate outlier" : null, ...row.flags.map((flag) => flag.kind)].filter(Boolean).join("; ") || null,
      cell: (row) => (
        <span className="flex flex-wrap gap-1">
          {row.outlier ? <span className="rounded-sm bg-caution-100 px-1 text-caption font-medium text-caution-700">outlier?</span> : null}
          {row.flags.map((flag) => (
            <FlagBadge key={flag.id} kind={flag.kind} />
          ))}
        </span>
      ),
      sortable: false,
    },
  ];
}

function Controls({ data, params, setParams }: { data: BrandComparisonData; params: URLSearchParams; setParams: (next: URLSearchParams) => void }) {
  const ids = { market: useId(), channel: useId(), sort: useId() };
  const set = (key: string, value: string, fallback: string) => {
    const next = new URLSearchParams(params);
    if (value === fallback) next.delete(key);
    else next.set(key, value);
    setParams(next);
  };
  return (
    <div className="mb-5 flex flex-wrap items-end gap-4">
      <div>
        <label htmlFor={ids.market} className="block text-small font-medium text-ink-800">
          Market
        </label>
        <select id={ids.market} className={`${inputClass} mt-1 w-52`} value={params.get("market") ?? ALL} onChange={(event) => set("market", event.target.value, ALL)}>
          <option value={ALL}>{data.markets.length > 1 ? `All ${data.markets.length} markets` : "All markets"}</option>
          {data.markets.map((market) => (
            <option key={market.id} value={market.id}>
              {market.name}
            </option>
          ))}
        </select>
      </div>
      <div>
        <label htmlFor={ids.channel} className="block text-small font-medium text-ink-800">
          Channel
        </label>
        <select id={ids.channel} className={`${inputClass} mt-1 w-52`} value={params.get("channel") ?? ALL} onChange={(event) => set("channel", event.target.value, ALL)}>
          <option value={ALL}>Every channel</option>
          {data.channels.map((channel) => (
            <option key={channel.channel} value={channel.channel}>
              {channel.name}
            </option>
          ))}
        </select>
      </div>
      <div>
        <label htmlFor={ids.sort} className="block text-small font-medium text-ink-800">
          Order
        </label>
        <select id={ids.sort} className={`${inputClass} mt-1 w-44`} value={params.get("sort") ?? "cheapest"} onChange={(event) => set("sort", event.target.value, "cheapest")}>
          {sorts.map((sort) => (
            <option key={sort} value={sort}>
              {comparisonSortLabels[sort]}
            </option>
          ))}
        </select>
      </div>
    </div>
  );
}

export function BrandComparison({ scopedToMarkets, channelSheetHref, noPublishedRun }: BrandComparisonProps) {
  const [params, setParams] = useSearchParams();
  const marketParam = params.get("market");
  const marketId = marketParam && marketParam !== ALL ? marketParam : null;
  const query = useBrandComparison(marketId);
  const data = query.data;
  const sortParam = params.get("sort");
  const sort: ComparisonSort = sorts.includes(sortParam as ComparisonSort) ? (sortParam as ComparisonSort) : "cheapest";
  const channelParam = params.get("channel");

  const shown = useMemo(() => {
    if (!data) return [];
    const channels = data.channels.filter((channel) => !channelParam || channelParam === ALL || channel.channel === channelParam);
    return channels.map((reference) => ({ reference, lines: comparisonLines(data, reference.channel, sort) })).filter((entry) => entry.lines.length > 0);
  }, [channelParam, data, sort]);

  const header = (
    <PageHeader
      title="Brand comparison"
      description={`What each channel costs per new customer in each brand${scopedToMarkets ? " in your markets" : ""}, side by side, against the portfolio-wide effect of the channel.`}
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
        <ErrorState title="The Brand comparison could not be loaded" message={query.error.message} onRetry={() => void query.refetch()} />
      </>
    );
  }
  if (!data) {
    return (
      <>
        {header}
        {noPublishedRun}
      </>
    );
  }

  const channelNames = new Map(data.channels.map((channel) => [channel.channel, channel]));
  const tableRows: TableRow[] = shown.flatMap(({ reference, lines }) =>
    lines.map((line) => ({ ...line, channelName: reference.name, portfolioMedian: channelNames.get(line.channel)?.portfolioEffect.q50 ?? NaN })),
  );
  const brandEffectsHidden = data.rows.length > 0 && data.rows.every((row) => row.brandEffect === null);

  return (
    <>
      {header}
      <RunStamp run={data.run} />
      <Controls data={data} params={params} setParams={(next) => setParams(next, { replace: true })} />
      {query.isFetching ? (
        <p className="sr-only" role="status">
          Loading…
        </p>
      ) : null}
      <p className="mb-4 max-w-3xl text-small text-ink-700">
        Figures: {data.basis.label}, in {data.currency}.{" "}
        {scopedToMarkets
          ? `Showing your markets only (${data.markets.map((market) => market.name).join(", ")}).`
          : null}{" "}
        {brandEffectsHidden ? "A brand’s effect across all its markets draws on markets outside your scope, so it is not shown." : null}
      </p>
      {shown.length === 0 ? (
        <EmptyState title="Nothing to compare">
          No brand has spend on {channelParam && channelParam !== ALL ? (channelNames.get(channelParam)?.name ?? channelParam) : "any channel"} in the markets shown.
        </EmptyState>
      ) : (
        <div className="space-y-5">
          <EstimateKey />
          <div className="space-y-8">
            {shown.map(({ reference, lines }) => (
              <section key={reference.channel} aria-label={`${reference.name}: brands compared`} className="rounded-lg border border-line bg-surface p-5 shadow-card">
                <ChannelComparisonChart reference={reference} lines={lines} currency={data.currency} />
              </section>
            ))}
          </div>
          <DataTable
            caption="Channels × brands"
            rows={tableRows}
            columns={tableColumns(data.currency, channelSheetHref)}
            rowKey={(row) => `${row.channel}|${row.key}`}
            csvFileName="brand-comparison.csv"
            csvHref={brandComparisonCsvHref(marketId)}
            emptyMessage="No estimates to list."
            pageSize={25}
            compact
          />
          <p className="text-caption text-ink-600">Rows are in the chosen order; select a column heading to sort by it instead.</p>
        </div>
      )}
    </>
  );
}
