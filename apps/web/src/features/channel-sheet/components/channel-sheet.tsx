import type { ChannelSheet as ChannelSheetData, Portfolio } from "@tributary/contracts";
import { useId, useMemo, type ReactNode } from "react";
import { useSearchParams } from "react-router-dom";
import { RunStamp } from "../../../components/results/run-stamp";
import { EmptyState } from "../../../components/ui/empty-state";
import { ErrorState } from "../../../components/ui/error-state";
import { inputClass } from "../../../components/ui/field";
import { LoadingState } from "../../../components/ui/loading-state";
import { ModelCaution } from "../../../components/ui/model-caution";
import { PageHeader } from "../../../components/ui/page-header";
import { ApiError } from "../../../lib/api-client";
import { channelSheetCsvHref, useChannelSheet, type ChannelSheetTable } from "../api/get-channel-sheet";
import { FlagHistory } from "./flag-history";
import { ProfitSlider } from "./profit-slider";
import { CacPosteriorChart, CarryOverChart, ContributionChart, PoolingComparisonChart, ResponseCurveChart } from "./sheet-charts";
import { SheetFacts } from "./sheet-facts";

type ChannelSheetProps = {
  /** Brands, markets, channels and cells the viewer may see, for the selectors. */
  portfolio: Portfolio;
  /** Shown when no run is published yet (renders nothing once one is). */
  noPublishedRun: ReactNode;
};

type Selection = { cellId: string; channel: string };

/** The cell × channel in the address, or the first one there is. */
function selectionFrom(params: URLSearchParams, portfolio: Portfolio): Selection | null {
  const cells = portfolio.cells.filter((cell) => cell.weeks > 0);
  const cellId = params.get("cell");
  const channel = params.get("channel");
  const cell = cells.find((candidate) => candidate.id === cellId) ?? sortedCells(portfolio)[0];
  const channelCode = portfolio.channels.find((candidate) => candidate.code === channel)?.code ?? portfolio.channels[0]?.code;
  if (!cell || !channelCode) return null;
  return { cellId: cell.id, channel: channelCode };
}

function sortedCells(portfolio: Portfolio) {
  const brand = new Map(portfolio.brands.map((b) => [b.id, b.name]));
  const market = new Map(portfolio.markets.map((m) => [m.id, m.name]));
  return portfolio.cells
    .filter((cell) => cell.weeks > 0)
    .sort((a, b) => (brand.get(a.brandId) ?? "").localeCompare(brand.get(b.brandId) ?? "") || (market.get(a.marketId) ?? "").localeCompare(market.get(b.marketId) ?? ""));
}

function Selectors({ portfolio, selection, onChange }: { portfolio: Portfolio; selection: Selection; onChange: (next: Selection) => void }) {
  const ids = { brand: useId(), market: useId(), channel: useId() };
  const cells = useMemo(() => sortedCells(portfolio), [portfolio]);
  const current = cells.find((cell) => cell.id === selection.cellId);
  const brands = portfolio.brands.filter((brand) => cells.some((cell) => cell.brandId === brand.id));
  const markets = portfolio.markets.filter((market) => cells.some((cell) => cell.marketId === market.id && cell.brandId === current?.brandId));
  const pick = (brandId: string, marketId: string) =>
    cells.find((cell) => cell.brandId === brandId && cell.marketId === marketId) ?? cells.find((cell) => cell.brandId === brandId);
  return (
    <div className="mb-5 flex flex-wrap items-end gap-4" role="group" aria-label="Which cell and channel">
      <div>
        <label htmlFor={ids.brand} className="block text-small font-medium text-ink-800">
          Brand
        </label>
        <select
          id={ids.brand}
          className={`${inputClass} mt-1 w-48`}
          value={current?.brandId ?? ""}
          onChange={(event) => {
            const cell = pick(event.target.value, current?.marketId ?? "");
            if (cell) onChange({ ...selection, cellId: cell.id });
          }}
        >
          {brands.map((brand) => (
            <option key={brand.id} value={brand.id}>
              {brand.name}
            </option>
          ))}
        </select>
      </div>
      <div>
        <label htmlFor={ids.market} className="block text-small font-medium text-ink-800">
          Market
        </label>
        <select
          id={ids.market}
          className={`${inputClass} mt-1 w-48`}
          value={current?.marketId ?? ""}
          onChange={(event) => {
            const cell = pick(current?.brandId ?? "", event.target.value);
            if (cell) onChange({ ...selection, cellId: cell.id });
          }}
        >
          {markets.map((market) => (
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
        <select id={ids.channel} className={`${inputClass} mt-1 w-48`} value={selection.channel} onChange={(event) => onChange({ ...selection, channel: event.target.value })}>
          {portfolio.channels.map((channel) => (
            <option key={channel.code} value={channel.code}>
              {channel.name}
            </option>
          ))}
        </select>
      </div>
    </div>
  );
}

const downloads: { table: ChannelSheetTable; label: string }[] = [
  { table: "response-curve", label: "Response curve" },
  { table: "carry-over", label: "Carry-over" },
  { table: "contribution", label: "Weekly contribution" },
  { table: "profit-draws", label: "Cost-per-customer draws" },
];

function Panel({ children, label }: { children: ReactNode; label: string }) {
  return (
    <section aria-label={label} className="rounded-lg border border-line bg-surface p-5 shadow-card">
      {children}
    </section>
  );
}

function Sheet({ sheet }: { sheet: ChannelSheetData }) {
  const { cellId } = sheet.cell;
  return (
    <div className="space-y-6">
      <SheetFacts sheet={sheet} />
      <FlagHistory flags={sheet.flagHistory} />
      {sheet.hasSpend ? (
        <>
          <div className="grid gap-6 xl:grid-cols-2">
            <Panel label="Posterior of the cost per new customer">
              <CacPosteriorChart sheet={sheet} />
            </Panel>
            <Panel label="Pooled and unpooled estimates">
              <PoolingComparisonChart sheet={sheet} />
            </Panel>
          </div>
          <Panel label="Chance of profit">
            <h2 className="mb-3 text-heading font-semibold text-ink-950">Chance of profit</h2>
            <div className="mb-4">
              <ModelCaution />
            </div>
            <ProfitSlider sheet={sheet} />
          </Panel>
          <div className="grid gap-6 xl:grid-cols-2">
            <Panel label="Response curve">
              <ResponseCurveChart sheet={sheet} />
            </Panel>
            <Panel label="Carry-over">
              <CarryOverChart sheet={sheet} />
            </Panel>
          </div>
          <Panel label="Weekly contribution">
            <ContributionChart sheet={sheet} />
          </Panel>
        </>
      ) : (
        <EmptyState title={`No spend on ${sheet.channel.name}`}>
          {sheet.cell.brand} in {sheet.cell.market} has no spend on {sheet.channel.name} in its data, so the model cannot say what the channel costs
          there. The estimate below is what pooling alone implies.
          <div className="mx-auto mt-4 max-w-2xl text-left">
            <PoolingComparisonChart sheet={sheet} />
          </div>
        </EmptyState>
      )}
      <nav aria-label="Download the numbers" className="flex flex-wrap items-center gap-x-4 gap-y-2 text-small">
        <span className="font-medium text-ink-800">Download as CSV:</span>
        {downloads.map(({ table, label }) => (
          <a key={table} href={channelSheetCsvHref(cellId, sheet.channel.code, table)} download className="text-stream-700 underline decoration-stream-200 underline-offset-2 hover:decoration-stream-700">
            {label}
          </a>
        ))}
      </nav>
    </div>
  );
}

export function ChannelSheet({ portfolio, noPublishedRun }: ChannelSheetProps) {
  const [params, setParams] = useSearchParams();
  const selection = selectionFrom(params, portfolio);
  const query = useChannelSheet(selection);
  const sheet = query.data;
  const header = (
    <PageHeader
      title="Channel sheet"
      description={
        sheet ? (
          <>
            <strong className="font-semibold text-ink-950">
              {sheet.cell.brand} in {sheet.cell.market}, {sheet.channel.name}
            </strong>
            : what the channel costs per new customer there, how it responds to spend and how long its effect lasts.
          </>
        ) : (
          "One brand in one market, one channel: what that channel costs per new customer, how it responds to spend and how long its effect lasts."
        )
      }
    />
  );
  if (!selection) {
    return (
      <>
        {header}
        <EmptyState title="No cells with data yet">Once a dataset is saved and a fit published, pick a brand, market and channel here.</EmptyState>
      </>
    );
  }
  const selectors = (
    <Selectors
      portfolio={portfolio}
      selection={selection}
      onChange={(next) => setParams(new URLSearchParams({ cell: next.cellId, channel: next.channel }), { replace: true })}
    />
  );
  return (
    <>
      {header}
      {sheet ? <RunStamp run={sheet.run} /> : null}
      {selectors}
      {query.isPending ? (
        <LoadingState label="Loading the channel sheet…" />
      ) : query.isError ? (
        query.error instanceof ApiError && query.error.status === 404 ? (
          <div className="space-y-4">
            <EmptyState title="No estimate for this cell and channel" compact>
              {query.error.message}
            </EmptyState>
            {noPublishedRun}
          </div>
        ) : (
          <ErrorState title="The Channel sheet could not be loaded" message={query.error.message} onRetry={() => void query.refetch()} />
        )
      ) : sheet ? (
        <Sheet sheet={sheet} />
      ) : null}
    </>
  );
}
