import type { Flag, MarketDesk as MarketDeskData, Portfolio } from "@tributary/contracts";
import { useId, type ReactNode } from "react";
import { useSearchParams } from "react-router-dom";
import { EstimateKey } from "../../../components/estimate/estimate-key";
import { logDomainOf } from "../../../components/estimate/interval-bar";
import { RunStamp } from "../../../components/results/run-stamp";
import { EmptyState } from "../../../components/ui/empty-state";
import { ErrorState } from "../../../components/ui/error-state";
import { inputClass } from "../../../components/ui/field";
import { LoadingState } from "../../../components/ui/loading-state";
import { ModelCaution } from "../../../components/ui/model-caution";
import { PageHeader } from "../../../components/ui/page-header";
import { useMarketDesk } from "../api/get-market-desk";
import { ChangesTable } from "./changes-table";
import { CellCard } from "./cell-card";
import { EstimatesTable } from "./estimates-table";
import { PlansTable } from "./plans-table";

type MarketDeskProps = {
  /** The markets the viewer may see (for the picker, before the desk loads). */
  portfolio: Portfolio;
  userName: string;
  scopedToMarkets: boolean;
  channelSheetHref: (selection: { cellId: string; channel: string }) => string;
  noPublishedRun: ReactNode;
  /** Downloads of the current fit's reports (composed by the route), shown below the plans. */
  reports?: ReactNode;
};

const ALL = "all";

function Section({ title, children, description }: { title: string; description?: ReactNode; children: ReactNode }) {
  return (
    <section aria-label={title} className="space-y-3">
      <div>
        <h2 className="text-heading font-semibold text-ink-950">{title}</h2>
        {description ? <p className="mt-0.5 max-w-3xl text-small text-ink-700">{description}</p> : null}
      </div>
      {children}
    </section>
  );
}

export function MarketDesk({ portfolio, userName, scopedToMarkets, channelSheetHref, noPublishedRun, reports }: MarketDeskProps) {
  const pickerId = useId();
  const [params, setParams] = useSearchParams();
  // A market manager starts with all their markets; other roles with one market at a time.
  const fallback = scopedToMarkets || portfolio.markets.length <= 1 ? ALL : (portfolio.markets[0]?.id ?? ALL);
  const requested = params.get("market");
  const choice = requested && (requested === ALL || portfolio.markets.some((market) => market.id === requested)) ? requested : fallback;
  const marketId = choice === ALL ? null : choice;
  const query = useMarketDesk(marketId);
  const desk = query.data;
  const marketNames = marketId ? (portfolio.markets.find((market) => market.id === marketId)?.name ?? "") : portfolio.markets.map((market) => market.name).join(", ");

  const header = (
    <PageHeader
      eyebrow={`Welcome, ${userName}`}
      title="Market desk"
      description={
        scopedToMarkets
          ? "Your markets: what each channel costs per new customer for each brand in the latest published fit, what changed since the fit before it, and your saved spend plans."
          : "One market at a time: each brand’s channels in the latest published fit, what changed since the fit before it, and saved spend plans."
      }
    />
  );

  if (portfolio.markets.length === 0) {
    return (
      <>
        {header}
        <EmptyState title="No markets yet">
          {scopedToMarkets ? "No markets are assigned to you yet. Ask an admin to add your markets." : "The portfolio has no markets yet."}
        </EmptyState>
      </>
    );
  }

  const picker =
    portfolio.markets.length > 1 ? (
      <div className="mb-5 flex flex-wrap items-end gap-3">
        <div>
          <label htmlFor={pickerId} className="block text-small font-medium text-ink-800">
            Market
          </label>
          <select
            id={pickerId}
            value={marketId ?? ALL}
            onChange={(event) => {
              const next = new URLSearchParams(params);
              next.set("market", event.target.value);
              setParams(next, { replace: true });
            }}
            className={`${inputClass} mt-1 w-60`}
          >
            <option value={ALL}>{scopedToMarkets ? "All my markets" : "Every market"}</option>
            {portfolio.markets.map((option) => (
              <option key={option.id} value={option.id}>
                {option.name}
              </option>
            ))}
          </select>
        </div>
        {scopedToMarkets ? <p className="pb-1.5 text-small text-ink-700">You look after {portfolio.markets.map((m) => m.name).join(", ")}.</p> : null}
      </div>
    ) : scopedToMarkets ? (
      <p className="mb-5 text-small text-ink-700">You look after {portfolio.markets[0]?.name}.</p>
    ) : null;

  if (query.isPending) {
    return (
      <>
        {header}
        {picker}
        <LoadingState label="Loading the current fit…" />
      </>
    );
  }
  if (query.isError) {
    return (
      <>
        {header}
        {picker}
        <ErrorState title="The Market desk could not be loaded" message={query.error.message} onRetry={() => void query.refetch()} />
      </>
    );
  }
  if (!desk) {
    return (
      <>
        {header}
        {noPublishedRun}
      </>
    );
  }

  return (
    <>
      {header}
      <RunStamp run={desk.run} />
      {picker}
      <div className="space-y-10">
        <Estimates desk={desk} marketId={marketId} marketNames={marketNames} channelSheetHref={channelSheetHref} />
        <Section
          title="What changed since the previous published fit"
          description={
            desk.previousRun ? (
              <>
                Low-spend cost per new customer in this fit against the fit published before it ({`dataset version ${desk.previousRun.datasetVersionNumber}`}), largest
                change first. “Beyond the uncertainty” means the two 90 % intervals do not overlap.
              </>
            ) : undefined
          }
        >
          {desk.previousRun ? (
            <ChangesTable desk={desk} marketId={marketId} />
          ) : (
            <EmptyState title="This is the first published fit" compact>
              Once a later fit is published, this lists how each brand’s channels moved between the two.
            </EmptyState>
          )}
        </Section>
        <Section title="Saved spend plans">
          {desk.plans.length > 0 ? (
            <PlansTable desk={desk} marketId={marketId} />
          ) : (
            <EmptyState title="No saved spend plans yet" compact>
              Spend scenarios and budget splits saved for {marketNames || "these markets"} appear here, with their approval status.
            </EmptyState>
          )}
        </Section>
        {reports}
      </div>
    </>
  );
}

function Estimates({
  desk,
  marketId,
  marketNames,
  channelSheetHref,
}: {
  desk: MarketDeskData;
  marketId: string | null;
  marketNames: string;
  channelSheetHref: MarketDeskProps["channelSheetHref"];
}) {
  const flagsById = new Map<string, Flag>(desk.flags.map((flag) => [flag.id, flag]));
  const domain = logDomainOf(desk.cells.flatMap((cell) => [cell.customerValue, ...cell.channels.filter((c) => c.hasSpend).flatMap((c) => [c.cac.q05, c.cac.q95])]));
  return (
    <Section
      title={`Estimates in ${marketNames}`}
      description={
        <>
          Per brand and channel: the {desk.basis.label} (median, 90 % interval), the chance of profit ({desk.profitBasis.label}) at the brand’s customer
          value, and how far pooling moved the estimate. Select a channel to open its Channel sheet.
        </>
      }
    >
      {desk.cells.length === 0 ? (
        <EmptyState title="No cells in this fit" compact>
          The published fit holds no brand in {marketNames || "these markets"}.
        </EmptyState>
      ) : (
        <>
          <div className="grid gap-4 xl:grid-cols-2">
            {desk.cells.map((cell) => (
              <CellCard key={cell.cellId} cell={cell} currency={desk.currency} domain={domain} flagsById={flagsById} channelSheetHref={channelSheetHref} />
            ))}
          </div>
          <EstimateKey referenceLabel="customer value" />
          <ModelCaution />
          <EstimatesTable desk={desk} marketId={marketId} marketNames={marketNames} flagsById={flagsById} />
        </>
      )}
    </Section>
  );
}
