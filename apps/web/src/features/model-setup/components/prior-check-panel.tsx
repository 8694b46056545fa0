import * as Plot from "@observablehq/plot";
import type { CellPriorCheck, PriorCheckResult } from "@tributary/stats";
import { useCallback, useId, useMemo, useState } from "react";
import { tokenColour } from "../../../components/chart/chart-colours";
import { compactNumber } from "../../../components/chart/axis-format";
import { PlotFigure } from "../../../components/chart/plot-figure";
import { DataTable, type DataTableColumn } from "../../../components/data-table/data-table";
import { inputClass } from "../../../components/ui/field";
import { LoadingState } from "../../../components/ui/loading-state";
import { formatMoney, formatNumber, formatWeek } from "../../../lib/format";
import type { PriorCheckState } from "../worker/use-prior-check";

const weekDate = (iso: string) => new Date(`${iso}T00:00:00Z`);
const addWeeks = (iso: string, weeks: number) => new Date(weekDate(iso).getTime() + weeks * 7 * 86_400_000);
const shareNumber = (share: number) => (Number.isFinite(share) ? formatNumber(share * 100, 2) : "–");
const percent = (share: number) => (Number.isFinite(share) ? `${formatNumber(share * 100, 2)} %` : "–");

function ChannelChart({ result, currency }: { result: PriorCheckResult; currency: string }) {
  const rows = result.channels.map((channel) => ({ ...channel.cac0, channel: channel.channel, lo: channel.cacRange[0], hi: channel.cacRange[1] }));
  const render = useCallback(
    (width: number) =>
      Plot.plot({
        width,
        height: 48 + rows.length * 40,
        marginLeft: 110,
        marginRight: 24,
        x: { type: "log", label: `Cost per new customer at low spend (${currency}, log scale)`, grid: true, tickFormat: compactNumber },
        y: { label: null, domain: rows.map((row) => row.channel) },
        marks: [
          Plot.ruleY(rows, { y: "channel", x1: "q05", x2: "q95", stroke: tokenColour("stream-500"), strokeWidth: 2 }),
          Plot.ruleY(rows, { y: "channel", x1: "q25", x2: "q75", stroke: tokenColour("stream-700"), strokeWidth: 9 }),
          Plot.dot(rows, { y: "channel", x: "q50", r: 4.5, fill: tokenColour("ink-900"), stroke: "white" }),
          Plot.tickX(rows, { y: "channel", x: "lo", stroke: tokenColour("silt-500"), strokeWidth: 3 }),
          Plot.tickX(rows, { y: "channel", x: "hi", stroke: tokenColour("silt-500"), strokeWidth: 3 }),
        ],
      }),
    [currency, rows],
  );
  return (
    <PlotFigure
      title="Cost per new customer the priors allow"
      caption={
        <>
          For each channel: thin bar, the 90 % range of the low-spend cost per new customer in a cell under the priors alone; thick bar, the middle 50 %; dot,
          the median. The two ochre ticks mark the range you entered. Pooling spread makes a single cell's range a little wider than yours.
        </>
      }
      render={render}
      table={{
        caption: `Prior cost per new customer by channel (${currency})`,
        columns: ["Channel", "Your low", "Your high", "Prior 5 %", "Prior median", "Prior 95 %"],
        rows: rows.map((row) => [row.channel, row.lo, row.hi, round(row.q05), round(row.q50), round(row.q95)]),
      }}
    />
  );
}

const round = (value: number) => Number(value.toPrecision(4));

function CellBandsChart({ cell, outcomeLabel }: { cell: CellPriorCheck; outcomeLabel: string }) {
  const rows = useMemo(
    () =>
      cell.observed.map((observed, t) => ({
        date: addWeeks(cell.firstWeek, t),
        observed,
        q05: cell.bands.q05[t]!,
        q25: cell.bands.q25[t]!,
        q50: cell.bands.q50[t]!,
        q75: cell.bands.q75[t]!,
        q95: cell.bands.q95[t]!,
      })),
    [cell],
  );
  const holdoutStart = cell.trainWeeks < cell.weeks ? addWeeks(cell.firstWeek, cell.trainWeeks) : null;
  const render = useCallback(
    (width: number) =>
      Plot.plot({
        width,
        height: 300,
        marginLeft: 64,
        x: { type: "utc", label: "Week" },
        y: { label: `${outcomeLabel} per week`, grid: true, tickFormat: compactNumber },
        marks: [
          Plot.areaY(rows, { x: "date", y1: "q05", y2: "q95", fill: tokenColour("stream-200"), fillOpacity: 0.7, curve: "step-after" }),
          Plot.areaY(rows, { x: "date", y1: "q25", y2: "q75", fill: tokenColour("stream-500"), fillOpacity: 0.55, curve: "step-after" }),
          Plot.lineY(rows, { x: "date", y: "q50", stroke: tokenColour("stream-700"), strokeWidth: 1.5, curve: "step-after" }),
          Plot.lineY(rows, { x: "date", y: "observed", stroke: tokenColour("ink-900"), strokeWidth: 1.6 }),
          Plot.ruleY([0], { stroke: tokenColour("ink-500") }),
          ...(holdoutStart ? [Plot.ruleX([holdoutStart], { stroke: tokenColour("silt-500"), strokeWidth: 2, strokeDasharray: "5 3" })] : []),
        ],
      }),
    [holdoutStart, outcomeLabel, rows],
  );
  return (
    <PlotFigure
      title={`${cell.brand} in ${cell.market}: weekly ${outcomeLabel}, observed and as the priors imply`}
      caption={
        <>
          Dark line: the observed {outcomeLabel} per week. Shaded: the weekly values the priors alone allow with this data's spend (light: 90 %, darker: 50 %,
          teal line: median). {holdoutStart ? `The dashed line marks the first held-out week (${formatWeek(holdoutStart.toISOString().slice(0, 10))}). ` : ""}
          A band far wider than the data, or reaching well below zero, means the priors are vaguer than what the team knows.
        </>
      }
      render={render}
      table={{
        caption: `Observed and prior ${outcomeLabel} per week, ${cell.brand} in ${cell.market}`,
        columns: ["Week", "Observed", "Prior 5 %", "Prior 25 %", "Prior median", "Prior 75 %", "Prior 95 %"],
        rows: rows.map((row) => [row.date.toISOString().slice(0, 10), row.observed, round(row.q05), round(row.q25), round(row.q50), round(row.q75), round(row.q95)]),
      }}
    />
  );
}

type CellRow = CellPriorCheck & { key: string };

function cellColumns(currency: string): DataTableColumn<CellRow>[] {
  return [
    { id: "cell", header: "Cell", value: (row) => `${row.brand} in ${row.market}` },
    { id: "weeks", header: "Weeks", value: (row) => row.weeks, align: "end" },
    {
      id: "observed",
      header: "Observed weekly range",
      value: (row) => `${formatNumber(row.observedMin)} – ${formatNumber(row.observedMax)}`,
      sortable: false,
    },
    {
      id: "prior",
      header: "Prior 90 % weekly range",
      value: (row) => `${formatNumber(row.outcome.q05)} – ${formatNumber(row.outcome.q95)}`,
      sortable: false,
    },
    {
      id: "spread",
      header: "Prior 95 % ÷ highest observed",
      value: (row) => (row.observedMax > 0 ? Number((row.outcome.q95 / row.observedMax).toFixed(2)) : null),
      cell: (row) => (row.observedMax > 0 ? `${formatNumber(row.outcome.q95 / row.observedMax, 2)}×` : "–"),
      align: "end",
    },
    { id: "belowZero", header: "Weeks below zero", value: (row) => round(row.belowZeroShare), cell: (row) => percent(row.belowZeroShare), align: "end" },
    {
      id: "mediaShare",
      header: "Share from media (median, 90 %)",
      value: (row) => round(row.mediaShare.q50),
      cell: (row) => `${percent(row.mediaShare.q50)} (${shareNumber(row.mediaShare.q05)}–${percent(row.mediaShare.q95)})`,
      align: "end",
    },
    {
      id: "cac",
      header: `Cheapest channel median CAC (${currency})`,
      value: (row) => (row.cac0.length > 0 ? round(Math.min(...row.cac0.map((entry) => entry.quantiles.q50))) : null),
      cell: (row) => (row.cac0.length > 0 ? formatMoney(Math.min(...row.cac0.map((entry) => entry.quantiles.q50)), currency) : "–"),
      align: "end",
    },
  ];
}

type PriorCheckPanelProps = {
  state: PriorCheckState;
  currency: string;
  outcomeLabel: string;
  /** Why the check is not running (no dataset chosen, settings not valid), if it is not. */
  pausedBecause: string | null;
};

/** What the priors alone imply, before any fit: recomputed in a worker as the settings change. */
export function PriorCheckPanel({ state, currency, outcomeLabel, pausedBecause }: PriorCheckPanelProps) {
  const selectId = useId();
  const [selected, setSelected] = useState(0);
  const result = state.result;
  const cell = result?.cells[Math.min(selected, result.cells.length - 1)];
  const rows = useMemo<CellRow[]>(() => (result ? result.cells.map((c) => ({ ...c, key: `${c.brand}|${c.market}` })) : []), [result]);

  const status = pausedBecause
    ? pausedBecause
    : state.status === "running"
      ? "Updating the prior check…"
      : state.status === "failed"
        ? `The prior check could not run: ${state.message ?? "unknown problem"}`
        : result && state.elapsedMs !== null
          ? `Computed from ${result.draws} draws of the priors in ${Math.round(state.elapsedMs)} ms.`
          : "";

  return (
    <section aria-labelledby="prior-check-title" className="rounded-lg border border-line bg-surface p-5 shadow-card">
      <div className="flex flex-wrap items-baseline justify-between gap-3">
        <h2 id="prior-check-title" className="text-heading font-semibold text-ink-900">
          Prior check
        </h2>
        <p role="status" aria-live="polite" data-prior-check-status={state.status} className={`text-small ${state.status === "failed" ? "text-alert-700" : "text-ink-600"}`}>
          {status}
        </p>
      </div>
      <p className="mt-1 max-w-3xl text-small text-ink-700">
        Before any fit: the costs per customer and the weekly outcomes that the priors alone allow, with this dataset's own spend pushed through carry-over and
        saturation. It changes as you change the settings.
      </p>
      {!result ? (
        state.status === "running" ? (
          <LoadingState label="Drawing from the priors…" />
        ) : null
      ) : (
        <div className={`mt-5 space-y-8 transition-opacity ${state.stale ? "opacity-60" : ""}`} aria-busy={state.status === "running"}>
          <ChannelChart result={result} currency={currency} />
          {cell ? (
            <div className="space-y-3">
              <div>
                <label htmlFor={selectId} className="block text-small font-medium text-ink-800">
                  Cell
                </label>
                <select id={selectId} className={`${inputClass} mt-1 w-80 max-w-full`} value={Math.min(selected, result.cells.length - 1)} onChange={(event) => setSelected(Number(event.target.value))}>
                  {result.cells.map((c, i) => (
                    <option key={`${c.brand}|${c.market}`} value={i}>
                      {c.brand} in {c.market}
                    </option>
                  ))}
                </select>
              </div>
              <CellBandsChart cell={cell} outcomeLabel={outcomeLabel} />
            </div>
          ) : null}
          <DataTable
            caption="Weekly outcome the priors allow, per cell"
            rows={rows}
            columns={cellColumns(currency)}
            rowKey={(row) => row.key}
            csvFileName="prior-check-cells.csv"
            initialSort={{ id: "spread", desc: true }}
          />
        </div>
      )}
    </section>
  );
}
