import { shrinkageMarkLabels, type CacInterval, type ChannelSheet } from "@tributary/contracts";
import type { ReactNode } from "react";
import { ShrinkageMark, describeShrinkage } from "../../../components/estimate/shrinkage-mark";
import { formatCac, formatMoney, formatWeek, formatWeeks } from "../../../lib/format";

function Fact({ label, children, note }: { label: string; children: ReactNode; note?: ReactNode }) {
  return (
    <div className="rounded-lg border border-line bg-surface px-4 py-3 shadow-card">
      <dt className="text-caption font-medium text-ink-700">{label}</dt>
      <dd className="mt-1">
        {children}
        {note ? <span className="mt-0.5 block text-caption text-ink-600">{note}</span> : null}
      </dd>
    </div>
  );
}

function Interval({ interval, currency }: { interval: CacInterval | null; currency: string }) {
  if (!interval) return <span className="text-body text-ink-600">not available</span>;
  return (
    <span className="block tabular-nums">
      <span className="text-heading font-semibold text-ink-950" data-value="median">
        {formatCac(interval.q50, currency)}
      </span>{" "}
      <span className="text-small text-ink-700" data-value="interval">
        90 %: {formatCac(interval.q05, currency)}–{formatCac(interval.q95, currency)}
      </span>
    </span>
  );
}

/** The sheet's headline numbers: pooled, unpooled and group costs, the marginal and recent costs, shrinkage, data. */
export function SheetFacts({ sheet }: { sheet: ChannelSheet }) {
  const { estimates, currency } = sheet;
  const mark = estimates.pooling.shrinkageMark;
  return (
    <section aria-label="Headline numbers" className="space-y-3">
      <dl className="grid gap-3 md:grid-cols-2 xl:grid-cols-4">
        <Fact label="Low-spend cost per new customer (pooled)" note={sheet.lowSpendCac.basis.label}>
          <Interval interval={estimates.pooled} currency={currency} />
        </Fact>
        <Fact label="This cell alone (no pooling)" note={estimates.unpooled ? "the same cost, fitted on this cell’s data only" : "this run has no no-pooling comparison"}>
          <Interval interval={estimates.unpooled} currency={currency} />
        </Fact>
        <Fact label={`Marginal cost at ${formatMoney(sheet.currentWeeklySpend, currency)} a week`} note={`the next customer at the current spend (mean of the last ${sheet.recentWeeks} fitted weeks)`}>
          <Interval interval={sheet.hasSpend ? sheet.marginalCac.summary : null} currency={currency} />
        </Fact>
        <Fact label={`Average cost, last ${sheet.recentWeeks} fitted weeks`} note={sheet.averageCac?.basis.label ?? "no spend in those weeks"}>
          <Interval interval={sheet.averageCac?.summary ?? null} currency={currency} />
        </Fact>
      </dl>
      <div className="flex flex-wrap items-center gap-x-6 gap-y-2 rounded-lg border border-line bg-surface px-4 py-3 text-small text-ink-800 shadow-card">
        <span className="inline-flex items-center gap-2">
          <ShrinkageMark shrinkage={estimates.pooling.shrinkage} withValue />
          <span>
            {describeShrinkage(estimates.pooling.shrinkage)}
            {mark ? <span className="text-ink-600"> · {shrinkageMarkLabels[mark].toLowerCase()}</span> : null}
          </span>
        </span>
        {estimates.group ? (
          <span>
            Group estimate: <span className="font-semibold tabular-nums">{formatCac(estimates.group.q50, currency)}</span>
          </span>
        ) : null}
        <span>
          Data: {formatWeeks(sheet.cell.weeks)} ({formatWeek(sheet.cell.firstWeek)} – {formatWeek(sheet.cell.lastWeek)}), {sheet.cell.fittedWeeks} fitted
        </span>
      </div>
      {estimates.outlier ? (
        <p className="rounded-md border border-silt-500/40 bg-caution-100 px-4 py-2 text-small text-ink-900">
          <strong className="font-semibold">Candidate outlier.</strong> {estimates.outlierReason ?? "The pooling review lists this cell × channel for a closer look."}
        </p>
      ) : null}
    </section>
  );
}
