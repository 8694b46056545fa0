import { DataTable, type DataTableColumn } from "../../../components/data-table/data-table";
import { ModelCaution } from "../../../components/ui/model-caution";
import type { ChannelName } from "../../../lib/channel-names";
import { formatMoney, formatNumber } from "../../../lib/format";
import { marginalCheck, type SplitLineView, type SplitView } from "../split/split-view";
import { AllocationChart, OutcomeHistogram } from "./split-charts";

const boundLabels = { lower: "at its lower bound", upper: "at its upper bound", fixed: "fixed (lower = upper)" } as const;
const percent = (share: number) => `${formatNumber(share * 100, 2)} %`;
/** The spread in per cent; below a millionth it is rounding noise of the solver and is said so. */
const spreadText = (spread: number) => (spread < 1e-6 ? "below 0.0001 %" : percent(spread));
const summary = (s: { q05: number; q50: number; q95: number }, signed = false) => {
  const f = (x: number) => (signed && x > 0 ? `+${formatNumber(x, 3)}` : formatNumber(x, 3));
  return `${f(s.q50)} (90 %: ${f(s.q05)} to ${f(s.q95)})`;
};

/** The equal-marginal-return check, shown so that anyone can see the split is an optimum (or why it need not be). */
export function MarginalReturnCheck({ view, currency }: { view: SplitView; currency: string }) {
  const check = marginalCheck(view.lines);
  const m = check.multiplier;
  const perThousand = m === null ? null : m * 1000;
  return (
    <section aria-labelledby="marginal-check-title" className="rounded-lg border border-line bg-surface p-4 shadow-card" data-marginal-equal={check.equal}>
      <h3 id="marginal-check-title" className="text-body font-semibold text-ink-900">
        Check: equal return at the margin
      </h3>
      {m === null ? (
        <p className="mt-2 text-small text-ink-800">Every line sits at a bound, so the bounds alone decide the split.</p>
      ) : (
        <dl className="mt-2 grid gap-3 text-small sm:grid-cols-3">
          <div>
            <dt className="text-ink-600">Multiplier (lines not at a bound)</dt>
            <dd className="text-heading font-semibold text-ink-900">
              {view.objective === "profit" ? `${formatNumber(m, 4)} ${currency} per ${currency}` : `${formatNumber(perThousand, 4)} per 1,000 ${currency}`}
            </dd>
            <dd className="text-caption text-ink-600">
              {view.objective === "profit"
                ? `Customer value each extra ${currency} brings at the margin (1 = break-even).`
                : `Expected new customers from the next 1,000 ${currency}: ${formatMoney(1 / m, currency)} per extra customer at the margin.`}
            </dd>
          </div>
          <div>
            <dt className="text-ink-600">Spread among them</dt>
            <dd className={`text-heading font-semibold ${check.equal ? "text-ok-700" : "text-caution-700"}`}>{spreadText(check.spread)}</dd>
            <dd className="text-caption text-ink-600">(largest − smallest) / mean, over {check.freeLines} {check.freeLines === 1 ? "line" : "lines"}</dd>
          </div>
          <div>
            <dt className="text-ink-600">Verdict</dt>
            <dd className={`font-semibold ${check.equal ? "text-ok-700" : "text-caution-700"}`}>{check.equal ? "✓ Equal: no move between these lines earns more" : "Not equal"}</dd>
            <dd className="text-caption text-ink-600">
              {check.equal
                ? "Moving budget from any line to another would lower the expected outcome."
                : view.risk.kind !== "expected"
                  ? "Expected: a risk attitude gives up some expected return for a safer outcome, so marginal returns differ."
                  : "The responses are S-shaped in some draws, so the split is an approximate optimum."}
            </dd>
          </div>
        </dl>
      )}
    </section>
  );
}

const lineColumns = (currency: string, objective: SplitView["objective"], channelName: ChannelName): DataTableColumn<SplitLineView>[] => [
  { id: "cell", header: "Cell", value: (line) => `${line.brand} in ${line.market}` },
  { id: "channel", header: "Channel", value: (line) => channelName(line.channel) },
  { id: "current", header: "Current", value: (line) => Math.round(line.current), cell: (line) => formatMoney(line.current, currency), align: "end" },
  { id: "allocation", header: "Split", value: (line) => Math.round(line.allocation), cell: (line) => <span className="font-semibold">{formatMoney(line.allocation, currency)}</span>, align: "end" },
  {
    id: "change",
    header: "Change",
    value: (line) => Math.round(line.allocation - line.current),
    cell: (line) => {
      const change = line.allocation - line.current;
      return <span className={`whitespace-nowrap ${change < 0 ? "text-alert-700" : change > 0 ? "text-ok-700" : ""}`}>{`${change > 0 ? "+" : ""}${formatMoney(change, currency)}`}</span>;
    },
    align: "end",
  },
  {
    id: "bounds",
    header: "Bounds",
    value: (line) => `${Math.round(line.lower)}–${line.upper === null ? "" : Math.round(line.upper)}`,
    cell: (line) => (line.lower === 0 && line.upper === null ? <span className="text-ink-500">none</span> : `${formatMoney(line.lower, currency)} – ${line.upper === null ? "no limit" : formatMoney(line.upper, currency)}`),
    align: "end",
  },
  {
    id: "bound",
    header: "At a bound",
    value: (line) => (line.activeBound ? boundLabels[line.activeBound] : null),
    cell: (line) => (line.activeBound ? <span className="rounded-sm bg-caution-100 px-1.5 py-0.5 text-caption text-caution-700">{boundLabels[line.activeBound]}</span> : <span className="text-ink-500">no</span>),
  },
  {
    id: "return",
    header: objective === "profit" ? "Value per extra unit" : "Customers per 1,000 more",
    value: (line) => Number((objective === "profit" ? line.weightedReturn : line.weightedReturn * 1000).toPrecision(6)),
    cell: (line) => formatNumber(objective === "profit" ? line.weightedReturn : line.weightedReturn * 1000, 4),
    align: "end",
  },
  {
    id: "marginal-cac",
    header: "Marginal cost per customer",
    value: (line) => (line.marginalCac === null ? null : Math.round(line.marginalCac)),
    cell: (line) => (line.marginalCac === null ? <span className="text-ink-600">no extra customers</span> : formatMoney(line.marginalCac, currency)),
    align: "end",
  },
  { id: "customers", header: "Expected customers", value: (line) => Math.round(line.expectedCustomers), cell: (line) => formatNumber(line.expectedCustomers, 4), align: "end" },
  { id: "beyond", header: "Above any spend in the data", value: (line) => (line.beyondObservedSpend ? "yes" : "no"), cell: (line) => (line.beyondObservedSpend ? <span className="text-caution-700">yes: extrapolated</span> : <span className="text-ink-500">no</span>) },
];

function boundWords(line: SplitLineView, currency: string): string {
  if (line.activeBound === "lower" && line.lower === 0) return "gets nothing";
  return `${boundLabels[line.activeBound!]} (${formatMoney(line.allocation, currency)})`;
}

/** "12 of 70 lines sit at a bound: 9 get nothing, 3 at their upper bound." */
export function boundSummary(atBounds: readonly SplitLineView[], total: number, equalAtMargin: boolean): string {
  const nothing = atBounds.filter((line) => line.activeBound === "lower" && line.lower === 0).length;
  const lower = atBounds.filter((line) => line.activeBound === "lower" && line.lower > 0).length;
  const upper = atBounds.filter((line) => line.activeBound === "upper").length;
  const fixed = atBounds.filter((line) => line.activeBound === "fixed").length;
  const parts = [
    nothing ? `${nothing} ${nothing === 1 ? "gets" : "get"} nothing` : null,
    lower ? `${lower} at ${lower === 1 ? "its" : "their"} lower bound` : null,
    upper ? `${upper} at ${upper === 1 ? "its" : "their"} upper bound` : null,
    fixed ? `${fixed} fixed` : null,
  ].filter(Boolean);
  return `${atBounds.length} of ${total} lines sit at a bound: ${parts.join(", ")}.${equalAtMargin ? " The rest share the budget at equal return." : ""}`;
}

function BoundChips({ lines, currency, channelName }: { lines: readonly SplitLineView[]; currency: string; channelName: ChannelName }) {
  return (
    <ul className="mt-2 flex flex-wrap gap-2 text-small">
      {lines.map((line) => (
        <li key={line.key} className="rounded-md border border-silt-500/40 bg-silt-100 px-2 py-1 text-ink-900">
          {channelName(line.channel)} in {line.brand} {line.market}: {boundWords(line, currency)}
        </li>
      ))}
    </ul>
  );
}

/** A split: its headline numbers, the optimality check, the lines at bounds, the allocation and the outcome's distribution. */
export function SplitResult({ view, currency, channelName, title = "Split result" }: { view: SplitView; currency: string; channelName: ChannelName; title?: string }) {
  const atBounds = view.lines.filter((line) => line.activeBound !== null);
  const outcome = view.objective === "profit" && view.profit ? view.profit : view.customers;
  return (
    <section aria-label={title} className="space-y-6">
      <div className="grid gap-4 xl:grid-cols-[minmax(0,3fr)_minmax(0,1fr)]">
        <dl className="grid gap-3 sm:grid-cols-3">
          <div className="rounded-md border border-line bg-surface p-3">
            <dt className="text-caption text-ink-600">Budget spent</dt>
            <dd className="text-heading font-semibold text-ink-900">{formatMoney(view.allocatedTotal, currency)}</dd>
            <dd className="text-caption text-ink-600">
              of {formatMoney(view.totalBudget, currency)} over {view.horizon} weeks; now {formatMoney(view.currentTotal, currency)}
            </dd>
          </div>
          <div className="rounded-md border border-line bg-surface p-3">
            <dt className="text-caption text-ink-600">{view.objective === "profit" ? `Profit (median, ${currency})` : "New customers (median)"}</dt>
            <dd className="text-heading font-semibold text-ink-900">{formatNumber(outcome.allocation.q50, 4)}</dd>
            <dd className="text-caption text-ink-600">
              90 %: {formatNumber(outcome.allocation.q05, 3)} to {formatNumber(outcome.allocation.q95, 3)}; at current spend {formatNumber(outcome.current.q50, 4)}
            </dd>
          </div>
          <div className="rounded-md border border-line bg-surface p-3">
            <dt className="text-caption text-ink-600">Gain over the current spend</dt>
            <dd className="text-heading font-semibold text-ink-900">{`${outcome.difference.q50 > 0 ? "+" : ""}${formatNumber(outcome.difference.q50, 4)}`}</dd>
            <dd className="text-caption text-ink-600">90 %: {formatNumber(outcome.difference.q05, 3)} to {formatNumber(outcome.difference.q95, 3)} (same draws)</dd>
          </div>
          {view.objective === "profit" ? (
            <p className="text-caption text-ink-600 sm:col-span-3">New customers: {summary(view.customers.allocation)} against {summary(view.customers.current)} at current spend.</p>
          ) : null}
          {view.riskCriterion ? (
            <p className="text-caption text-ink-600 sm:col-span-3">
              Risk criterion ({view.riskCriterion.name}): {formatNumber(view.riskCriterion.allocation, 4)} for this split, {formatNumber(view.riskCriterion.expectedValueSolution, 4)} for the
              expected-value split, {formatNumber(view.riskCriterion.current, 4)} at current spend.
            </p>
          ) : null}
        </dl>
        <ModelCaution />
      </div>

      <MarginalReturnCheck view={view} currency={currency} />

      <section aria-labelledby="bounds-hit-title">
        <h3 id="bounds-hit-title" className="text-body font-semibold text-ink-900">
          Lines at a bound
        </h3>
        {atBounds.length === 0 ? (
          <p className="mt-1 text-small text-ink-700">None: every line was free to move.</p>
        ) : (
          <>
            <p className="mt-1 text-small text-ink-700">{boundSummary(atBounds, view.lines.length, marginalCheck(view.lines).equal)}</p>
            {atBounds.length <= 8 ? (
              <BoundChips lines={atBounds} currency={currency} channelName={channelName} />
            ) : (
              <details className="mt-1">
                <summary className="cursor-pointer text-small font-medium text-stream-700">Show the {atBounds.length} lines</summary>
                <BoundChips lines={atBounds} currency={currency} channelName={channelName} />
              </details>
            )}
          </>
        )}
      </section>

      <div className="grid gap-6 xl:grid-cols-2">
        <AllocationChart view={view} currency={currency} channelName={channelName} />
        <OutcomeHistogram view={view} currency={currency} />
      </div>
      <DataTable
        caption="Allocation per line"
        rows={view.lines}
        columns={lineColumns(currency, view.objective, channelName)}
        rowKey={(line) => line.key}
        csvFileName="budget-split-allocation.csv"
        initialSort={{ id: "allocation", desc: true }}
        pageSize={20}
        compact
      />
      <ul className="space-y-1 text-caption text-ink-600">
        {view.notes.map((note) => (
          <li key={note}>{note}</li>
        ))}
        <li>Method: {view.method}.</li>
      </ul>
    </section>
  );
}
