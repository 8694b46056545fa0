import type { Flag, PoolingReview as PoolingReviewData, Run } from "@tributary/contracts";
import { useId, useMemo, useRef, useState, type ReactNode } from "react";
import { Link, useSearchParams } from "react-router-dom";
import { DataTable, type DataTableColumn } from "../../../components/data-table/data-table";
import { FlagBadge } from "../../../components/estimate/flag-badge";
import { ShrinkageMark } from "../../../components/estimate/shrinkage-mark";
import { RunStamp, runLabel } from "../../../components/results/run-stamp";
import { Button } from "../../../components/ui/button";
import { EmptyState } from "../../../components/ui/empty-state";
import { ErrorState } from "../../../components/ui/error-state";
import { inputClass } from "../../../components/ui/field";
import { LoadingState } from "../../../components/ui/loading-state";
import { PageHeader } from "../../../components/ui/page-header";
import { formatCac, formatDateTime } from "../../../lib/format";
import { useCreateFlag } from "../api/create-flag";
import { poolingReviewCsvHref, usePoolingReview } from "../api/get-pooling-review";
import { FlagForm, type FlagTarget } from "./flag-form";
import { FlagsTable } from "./flags-table";
import { PoolingFactors } from "./pooling-factors";
import { rowKey, rowLabel, ShrinkageArrows } from "./shrinkage-arrows";

type ReviewRow = PoolingReviewData["rows"][number];

type PoolingReviewProps = {
  noPublishedRun: ReactNode;
  channelSheetHref: (selection: { cellId: string; channel: string }) => string;
  /** Finished runs that can be reviewed, newest first (the current one among them). */
  runs: Run[];
};

const ALL = "all";

/** Largest shrinkage first, values outside 0–1 where their number puts them; undefined shrinkage last. */
function byShrinkage(a: ReviewRow, b: ReviewRow): number {
  const x = a.pooling.shrinkage;
  const y = b.pooling.shrinkage;
  if (x === null || y === null) return x === null ? (y === null ? 0 : 1) : -1;
  return y - x;
}

function Section({ title, description, children }: { title: string; description?: ReactNode; children: ReactNode }) {
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

function estimateColumns(review: PoolingReviewData, flagsById: Map<string, Flag>, onFlag: (target: FlagTarget) => void): DataTableColumn<ReviewRow>[] {
  const money = (value: number | null | undefined) => (value === null || value === undefined ? null : Number(value.toPrecision(4)));
  const cac = (value: number | null | undefined) => (value === null || value === undefined ? "–" : formatCac(value, review.currency));
  return [
    { id: "brand", header: "Brand", value: (row) => row.brand },
    { id: "market", header: "Market", value: (row) => row.market },
    { id: "channel", header: "Channel", value: (row) => row.channelName },
    { id: "unpooled", header: "No pooling", value: (row) => money(row.unpooled?.q50), cell: (row) => cac(row.unpooled?.q50), align: "end" },
    { id: "pooled", header: "Pooled", value: (row) => money(row.pooled.q50), cell: (row) => cac(row.pooled.q50), align: "end" },
    { id: "group", header: "Group", value: (row) => money(row.group?.q50), cell: (row) => cac(row.group?.q50), align: "end" },
    {
      id: "shrinkage",
      header: "Shrinkage",
      value: (row) => (row.pooling.shrinkage === null ? null : Number(row.pooling.shrinkage.toFixed(3))),
      cell: (row) => <ShrinkageMark shrinkage={row.pooling.shrinkage} withValue />,
      align: "end",
    },
    {
      id: "notes",
      header: "Outlier / flag",
      value: (row) => [row.outlier ? "candidate outlier" : null, ...row.flagIds.map((id) => flagsById.get(id)?.kind ?? null)].filter(Boolean).join("; ") || null,
      cell: (row) => (
        <span className="flex flex-wrap items-center gap-1">
          {row.outlier ? <span className="rounded-sm bg-caution-100 px-1 text-caption font-medium text-caution-700">outlier?</span> : null}
          {row.flagIds.map((id) => flagsById.get(id)).map((flag) => (flag ? <FlagBadge key={flag.id} kind={flag.kind} compact /> : null))}
        </span>
      ),
    },
    {
      id: "action",
      header: "Flag",
      value: () => null,
      cell: (row) => (
        <Button variant="quiet" className="px-2! py-0.5!" onClick={() => onFlag({ cellId: row.cellId, channel: row.channel })} aria-label={`Flag ${rowLabel(row)}`}>
          Flag…
        </Button>
      ),
      sortable: false,
    },
  ];
}

function RunPicker({ runs, shown, onChange }: { runs: Run[]; shown: Run; onChange: (runId: string | null) => void }) {
  const id = useId();
  const options = runs.some((run) => run.id === shown.id) ? runs : [shown, ...runs];
  if (options.length < 2) return null;
  return (
    <div className="mb-6">
      <label htmlFor={id} className="block text-small font-medium text-ink-800">
        Run to review
      </label>
      <select id={id} className={`${inputClass} mt-1 w-[32rem] max-w-full`} value={shown.id} onChange={(event) => onChange(options.find((run) => run.id === event.target.value)?.current ? null : event.target.value)}>
        {options.map((run) => (
          <option key={run.id} value={run.id}>
            {runLabel(run)}, fitted {run.finishedAt ? formatDateTime(run.finishedAt) : "–"}
            {run.current ? " · current" : ""}
            {run.trust.trustworthy === false ? " · not trustworthy" : ""}
          </option>
        ))}
      </select>
    </div>
  );
}

export function PoolingReview({ noPublishedRun, channelSheetHref, runs }: PoolingReviewProps) {
  const [params, setParams] = useSearchParams();
  const runId = params.get("run");
  const query = usePoolingReview(runId);
  const createFlag = useCreateFlag();
  const review = query.data;
  const ids = { channel: useId(), focus: useId() };
  const [target, setTarget] = useState<FlagTarget | null>(null);
  const formRef = useRef<HTMLDivElement>(null);
  const channelFilter = params.get("channel") ?? ALL;
  const onlyNotable = params.get("show") === "notable";

  const flagsById = useMemo(() => new Map((review?.flags ?? []).map((flag) => [flag.id, flag])), [review]);
  const shownRows = useMemo(
    () =>
      (review?.rows ?? [])
        .filter((row) => (channelFilter === ALL || row.channel === channelFilter) && (!onlyNotable || row.outlier || row.flagIds.length > 0))
        .sort(byShrinkage),
    [channelFilter, onlyNotable, review],
  );

  const header = (
    <PageHeader
      title="Pooling review"
      description="How far pooling moved each cell’s estimate toward its peers, which cells look like outliers, and the flags analysts raised on them."
    />
  );
  if (query.isPending) {
    return (
      <>
        {header}
        <LoadingState label="Loading the run’s estimates…" />
      </>
    );
  }
  if (query.isError) {
    return (
      <>
        {header}
        <ErrorState title="The Pooling review could not be loaded" message={query.error.message} onRetry={() => void query.refetch()} />
      </>
    );
  }
  if (!review) {
    return (
      <>
        {header}
        {noPublishedRun}
      </>
    );
  }

  const setParam = (key: string, value: string | null) => {
    const next = new URLSearchParams(params);
    if (value === null) next.delete(key);
    else next.set(key, value);
    setParams(next, { replace: true });
  };
  const flagThis = (next: FlagTarget) => {
    setTarget({ ...next });
    formRef.current?.scrollIntoView({ block: "start", behavior: "smooth" });
  };
  const cells = [...new Map(review.rows.map((row) => [row.cellId, { cellId: row.cellId, label: `${row.brand} · ${row.market}` }])).values()].sort((a, b) => a.label.localeCompare(b.label));
  const channelOrder = review.channels.map((channel) => channel.channel);
  const activeFlags = review.rows.filter((row) => row.flagIds.length > 0).length;

  return (
    <>
      {header}
      <RunStamp run={review.run} lead={review.run.current ? "Numbers on this screen come from" : "You are reviewing"} />
      <RunPicker runs={runs} shown={review.run} onChange={(next) => setParam("run", next)} />
      <p className="mb-6 text-small text-ink-700">
        {review.rows.length} cell × channel estimates · {review.outliers.length} candidate {review.outliers.length === 1 ? "outlier" : "outliers"} ·{" "}
        {activeFlags} flagged. Figures: {review.basis.label}, in {review.currency}.
      </p>
      <div className="space-y-10">
        <Section title="Shrinkage, cell by cell">
          <div className="flex flex-wrap items-end gap-4">
            <div>
              <label htmlFor={ids.channel} className="block text-small font-medium text-ink-800">
                Channel
              </label>
              <select id={ids.channel} className={`${inputClass} mt-1 w-52`} value={channelFilter} onChange={(event) => setParam("channel", event.target.value === ALL ? null : event.target.value)}>
                <option value={ALL}>Every channel</option>
                {review.channels.map((channel) => (
                  <option key={channel.channel} value={channel.channel}>
                    {channel.name}
                  </option>
                ))}
              </select>
            </div>
            <label className="flex items-center gap-2 pb-1.5 text-small text-ink-800">
              <input id={ids.focus} type="checkbox" className="accent-stream-700" checked={onlyNotable} onChange={(event) => setParam("show", event.target.checked ? "notable" : null)} />
              Only candidate outliers and flagged estimates
            </label>
          </div>
          {shownRows.length === 0 ? (
            <EmptyState title="Nothing to show" compact>
              No estimate matches these choices.
            </EmptyState>
          ) : (
            <div className="rounded-lg border border-line bg-surface p-5 shadow-card">
              <ShrinkageArrows rows={shownRows} channelOrder={channelOrder} flagsById={flagsById} currency={review.currency} />
            </div>
          )}
        </Section>

        <div className="grid gap-8 xl:grid-cols-[minmax(0,1fr)_minmax(0,1fr)]">
          <Section title="Candidate outliers" description="Cells whose own estimate disagrees with their group, or that pooling moved a long way although they have long data. You decide.">
            {review.outliers.length === 0 ? (
              <EmptyState title="No candidate outliers" compact>
                Every cell’s own estimate is in line with its group.
              </EmptyState>
            ) : (
              <ul className="space-y-2">
                {review.outliers.map((outlier) => {
                  const row = review.rows.find((candidate) => candidate.cellId === outlier.cellId && candidate.channel === outlier.channel);
                  return (
                    <li key={rowKey(outlier)} className="rounded-lg border border-silt-500/40 bg-surface px-4 py-3 shadow-card">
                      <div className="flex flex-wrap items-start justify-between gap-2">
                        <div className="min-w-0">
                          <p className="font-semibold text-ink-950">{rowLabel(outlier)}</p>
                          <p className="text-small text-ink-700">{outlier.reason}</p>
                          {row ? (
                            <p className="mt-1 flex flex-wrap items-center gap-2 text-caption text-ink-600">
                              no pooling {row.unpooled ? formatCac(row.unpooled.q50, review.currency) : "–"} → pooled {formatCac(row.pooled.q50, review.currency)}
                              <ShrinkageMark shrinkage={row.pooling.shrinkage} withValue />
                              {row.flagIds.map((id) => flagsById.get(id)).map((flag) => (flag ? <FlagBadge key={flag.id} kind={flag.kind} /> : null))}
                            </p>
                          ) : null}
                        </div>
                        <div className="flex shrink-0 items-center gap-2">
                          <Link className="text-small text-stream-700 underline" to={channelSheetHref({ cellId: outlier.cellId, channel: outlier.channel })}>
                            Channel sheet
                          </Link>
                          <Button variant="secondary" className="px-2.5! py-1!" onClick={() => flagThis({ cellId: outlier.cellId, channel: outlier.channel })} aria-label={`Flag ${rowLabel(outlier)}`}>
                            Flag…
                          </Button>
                        </div>
                      </div>
                    </li>
                  );
                })}
              </ul>
            )}
          </Section>
          <div ref={formRef} className="scroll-mt-6 self-start xl:sticky xl:top-6">
            <Section title="Flag an estimate" description="Flags belong to the cell and channel and show on every screen until someone clears them.">
              <div className="rounded-lg border border-line bg-surface p-5 shadow-card">
                <FlagForm
                  cells={cells}
                  channels={review.channels.map((channel) => ({ code: channel.channel, name: channel.name }))}
                  runId={review.run.id}
                  target={target}
                  onSubmit={(input) => createFlag.mutateAsync(input)}
                />
              </div>
            </Section>
          </div>
        </div>

        <Section title="Pooling factors per level">
          <PoolingFactors review={review} runId={runId} />
        </Section>

        <Section title="Every estimate">
          <DataTable
            caption="Unpooled, pooled and group estimates"
            rows={review.rows}
            columns={estimateColumns(review, flagsById, flagThis)}
            rowKey={(row) => rowKey(row)}
            csvFileName="pooling-review-estimates.csv"
            csvHref={poolingReviewCsvHref("estimates", runId)}
            initialSort={{ id: "shrinkage", desc: true }}
            pageSize={20}
            compact
          />
        </Section>

        <Section title="Flags, who raised them and when">
          <FlagsTable />
        </Section>
      </div>
    </>
  );
}
