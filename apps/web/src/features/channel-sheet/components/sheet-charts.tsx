// The Channel sheet's charts: posterior of the cost per new customer, response curve,
// carry-over, weekly contribution against the baseline, and pooled beside unpooled.
import * as Plot from "@observablehq/plot";
import type { CacInterval, ChannelSheet } from "@tributary/contracts";
import { useCallback, useMemo } from "react";
import { compactNumber } from "../../../components/chart/axis-format";
import { seriesColour, tokenColour } from "../../../components/chart/chart-colours";
import { PlotFigure } from "../../../components/chart/plot-figure";
import { formatCac, formatMoney, formatNumber, formatWeek } from "../../../lib/format";

const r = (value: number | null | undefined) => (value === null || value === undefined ? null : Number(value.toPrecision(4)));
const weekDate = (iso: string) => new Date(`${iso.slice(0, 10)}T00:00:00Z`);

// ---------------------------------------------------------------------------------

type HistogramBar = { panel: string; x1: number; x2: number; share: number };

/** Low-spend and marginal cost per new customer as two histograms on one log axis. */
export function CacPosteriorChart({ sheet }: { sheet: ChannelSheet }) {
  const panels = useMemo(
    () => [
      { name: "At low spend", posterior: sheet.lowSpendCac, colour: 0 },
      { name: `At the margin of ${formatMoney(sheet.currentWeeklySpend, sheet.currency)} a week`, posterior: sheet.marginalCac, colour: 1 },
    ],
    [sheet],
  );
  const bars = useMemo<HistogramBar[]>(
    () =>
      panels.flatMap(({ name, posterior }) =>
        posterior.histogram.counts.map((count, i) => ({
          panel: name,
          x1: posterior.histogram.edges[i]!,
          x2: posterior.histogram.edges[i + 1]!,
          share: posterior.histogram.total > 0 ? count / posterior.histogram.total : 0,
        })),
      ),
    [panels],
  );
  const customerValue = sheet.cell.customerValue;
  const render = useCallback(
    (width: number) => {
      const edges = bars.flatMap((bar) => [bar.x1, bar.x2]).filter((v) => v > 0);
      const domain: [number, number] = [Math.min(...edges, customerValue ?? Infinity) / 1.1, Math.max(...edges, customerValue ?? 0) * 1.1];
      const top = Math.max(...bars.map((bar) => bar.share), 0.01) * 1.15;
      // Two histograms on the same x axis, one above the other, each with its own heading.
      const holder = document.createElement("div");
      panels.forEach(({ name, posterior }, i) => {
        const heading = document.createElement("p");
        heading.textContent = name;
        heading.style.cssText = `font-size:12px;font-weight:600;color:${seriesColour(i)};margin:${i === 0 ? 0 : 8}px 0 0 56px`;
        holder.append(heading);
        const last = i === panels.length - 1;
        holder.append(
          Plot.plot({
            width,
            height: last ? 170 : 130,
            marginLeft: 56,
            marginRight: 16,
            marginTop: 14,
            marginBottom: last ? 40 : 6,
            x: { type: "log", domain, label: last ? `Cost per new customer (${sheet.currency}, log scale) →` : null, grid: true, tickFormat: compactNumber, axis: last ? "bottom" : null },
            y: { domain: [0, top], label: "↑ Share of draws", tickFormat: (v: number) => `${Math.round(v * 100)} %`, grid: true, ticks: 3 },
            marks: [
              Plot.rectY(
                bars.filter((bar) => bar.panel === name),
                { x1: "x1", x2: "x2", y: "share", fill: seriesColour(i), fillOpacity: 0.85, inset: 0.5 },
              ),
              Plot.ruleX([posterior.summary.q50], { stroke: tokenColour("ink-900"), strokeWidth: 2 }),
              Plot.text([posterior.summary.q50], { x: (d: number) => d, frameAnchor: "top", dy: -12, dx: 4, textAnchor: "start", text: (d: number) => `median ${formatCac(d, sheet.currency)}`, fill: tokenColour("ink-900") }),
              ...(customerValue ? [Plot.ruleX([customerValue], { stroke: tokenColour("silt-500"), strokeWidth: 2, strokeDasharray: "5 3" })] : []),
              Plot.ruleY([0], { stroke: tokenColour("ink-500") }),
            ],
          }),
        );
      });
      return holder;
    },
    [bars, customerValue, panels, sheet.currency],
  );
  const low = sheet.lowSpendCac.summary;
  const marginal = sheet.marginalCac.summary;
  return (
    <PlotFigure
      title="What a new customer costs: the posterior"
      caption={
        <>
          Posterior draws of the cost per new customer, as the share of draws in each bin (bins equally wide on the log scale). Top: at low
          spend ({sheet.lowSpendCac.basis.label}), median {formatCac(low.q50, sheet.currency)}, 90 %: {formatCac(low.q05, sheet.currency)}–
          {formatCac(low.q95, sheet.currency)}. Bottom: at the margin of the current weekly spend, median {formatCac(marginal.q50, sheet.currency)}, 90 %:{" "}
          {formatCac(marginal.q05, sheet.currency)}–{formatCac(marginal.q95, sheet.currency)}.
          {customerValue ? ` Dashed ochre line: the brand’s customer value, ${formatMoney(customerValue, sheet.currency)}.` : ""}
        </>
      }
      render={render}
      table={{
        caption: `Histogram of the cost per new customer (${sheet.currency})`,
        columns: ["Which", "Bin from", "Bin to", "Share of draws"],
        rows: bars.map((bar) => [bar.panel, r(bar.x1), r(bar.x2), Number(bar.share.toFixed(4))]),
      }}
    />
  );
}

// ---------------------------------------------------------------------------------

export function ResponseCurveChart({ sheet }: { sheet: ChannelSheet }) {
  const { points, currentWeeklySpend, maxObservedWeeklySpend } = sheet.responseCurve;
  const rows = useMemo(() => points.map((point) => ({ s: point.weeklySpend, ...point.response })), [points]);
  const render = useCallback(
    (width: number) =>
      Plot.plot({
        width,
        height: 300,
        marginLeft: 56,
        marginRight: 20,
        marginBottom: 40,
        x: { label: `Weekly spend on ${sheet.channel.name} (${sheet.currency}) →`, grid: true, tickFormat: compactNumber },
        y: { label: "↑ New customers per week from the channel", grid: true, tickFormat: compactNumber },
        marks: [
          Plot.areaY(rows, { x: "s", y1: "q05", y2: "q95", fill: tokenColour("stream-200"), fillOpacity: 0.8 }),
          Plot.areaY(rows, { x: "s", y1: "q25", y2: "q75", fill: tokenColour("stream-500"), fillOpacity: 0.55 }),
          Plot.lineY(rows, { x: "s", y: "q50", stroke: tokenColour("stream-800"), strokeWidth: 2 }),
          Plot.ruleX([currentWeeklySpend], { stroke: tokenColour("ink-900"), strokeWidth: 2 }),
          Plot.text([currentWeeklySpend], { x: (d: number) => d, frameAnchor: "top", dx: 4, dy: 2, textAnchor: "start", text: () => "current spend", fill: tokenColour("ink-900") }),
          ...(maxObservedWeeklySpend > 0
            ? [
                Plot.ruleX([maxObservedWeeklySpend], { stroke: tokenColour("ink-500"), strokeDasharray: "3 3" }),
                Plot.text([maxObservedWeeklySpend], { x: (d: number) => d, frameAnchor: "top", dx: -4, dy: 18, textAnchor: "end", text: () => "largest week seen", fill: tokenColour("ink-600") }),
              ]
            : []),
          Plot.ruleY([0], { stroke: tokenColour("ink-500") }),
        ],
      }),
    [currentWeeklySpend, maxObservedWeeklySpend, rows, sheet.channel.name, sheet.currency],
  );
  return (
    <PlotFigure
      title="Response curve"
      caption={
        <>
          New customers per week that a constant weekly spend brings once carry-over has built up: median (line), 50 % band (dark) and 90 % band (light).
          Solid upright line: the current spend ({formatMoney(currentWeeklySpend, sheet.currency)} a week, the mean of the last {sheet.recentWeeks} fitted
          weeks); dotted: the largest weekly spend in the data ({formatMoney(maxObservedWeeklySpend, sheet.currency)}). Beyond it the curve is the model’s
          extrapolation.
        </>
      }
      render={render}
      table={{
        caption: `Response curve of ${sheet.channel.name}: new customers per week by weekly spend (${sheet.currency})`,
        columns: ["Weekly spend", "5 %", "25 %", "Median", "75 %", "95 %", "Marginal CAC median"],
        rows: points.map((p) => [r(p.weeklySpend), r(p.response.q05), r(p.response.q25), r(p.response.q50), r(p.response.q75), r(p.response.q95), r(p.marginalCac.q50)]),
      }}
    />
  );
}

// ---------------------------------------------------------------------------------

export function CarryOverChart({ sheet }: { sheet: ChannelSheet }) {
  const { lags, alpha, maxLag } = sheet.carryOver;
  const render = useCallback(
    (width: number) =>
      Plot.plot({
        width,
        height: 260,
        marginLeft: 56,
        marginBottom: 40,
        x: { type: "band", label: "Weeks after the spend →", domain: lags.map((lag) => lag.lag), padding: 0.3 },
        y: { label: "↑ Share of the spend’s effect", tickFormat: (v: number) => `${Math.round(v * 100)} %`, grid: true },
        marks: [
          Plot.barY(lags, { x: "lag", y: "q50", fill: seriesColour(0), fillOpacity: 0.75 }),
          Plot.ruleX(lags, { x: "lag", y1: "q05", y2: "q95", stroke: tokenColour("ink-900"), strokeWidth: 1.5 }),
          Plot.tickY(lags, { x: "lag", y: "q05", stroke: tokenColour("ink-900") }),
          Plot.tickY(lags, { x: "lag", y: "q95", stroke: tokenColour("ink-900") }),
          Plot.ruleY([0], { stroke: tokenColour("ink-500") }),
        ],
      }),
    [lags],
  );
  return (
    <PlotFigure
      title="Carry-over"
      caption={
        <>
          How a week’s spend keeps working over the following weeks (geometric carry-over over {maxLag} weeks): bars, the median share of the effect in
          each week; whiskers, 90 % intervals. Weekly carry-over rate α: median {formatNumber(alpha.q50, 2)} (90 %: {formatNumber(alpha.q05, 2)}–
          {formatNumber(alpha.q95, 2)}).
        </>
      }
      render={render}
      table={{
        caption: "Share of a week's spend effect by week after the spend",
        columns: ["Weeks after", "5 %", "Median", "95 %"],
        rows: lags.map((lag) => [lag.lag, r(lag.q05), r(lag.q50), r(lag.q95)]),
      }}
    />
  );
}

// ---------------------------------------------------------------------------------

export function ContributionChart({ sheet }: { sheet: ChannelSheet }) {
  const c = sheet.contribution;
  const rows = useMemo(
    () =>
      c.weeks.map((week, t) => ({
        date: weekDate(week),
        observed: c.observed[t] ?? null,
        fitted: c.fitted[t] ?? true,
        b05: c.baseline.q05[t]!,
        b50: c.baseline.q50[t]!,
        b95: c.baseline.q95[t]!,
        c05: c.contribution.q05[t]!,
        c25: c.contribution.q25[t]!,
        c50: c.contribution.q50[t]!,
        c75: c.contribution.q75[t]!,
        c95: c.contribution.q95[t]!,
      })),
    [c],
  );
  const holdoutStart = rows.find((row) => !row.fitted)?.date ?? null;
  const render = useCallback(
    (width: number) =>
      Plot.plot({
        width,
        height: 320,
        marginLeft: 56,
        marginBottom: 40,
        x: { type: "utc", label: "Week →" },
        y: { label: "↑ New customers per week", grid: true, tickFormat: compactNumber },
        marks: [
          ...(holdoutStart ? [Plot.rectX([holdoutStart], { x1: (d: Date) => d, x2: () => rows[rows.length - 1]!.date, fill: tokenColour("ink-100"), fillOpacity: 0.7 })] : []),
          Plot.areaY(rows, { x: "date", y1: "b05", y2: "b95", fill: tokenColour("ink-200"), fillOpacity: 0.8, curve: "step-after" }),
          Plot.lineY(rows, { x: "date", y: "b50", stroke: tokenColour("ink-600"), strokeWidth: 1.2, strokeDasharray: "4 2", curve: "step-after" }),
          Plot.areaY(rows, { x: "date", y1: "c05", y2: "c95", fill: seriesColour(0), fillOpacity: 0.3, curve: "step-after" }),
          Plot.areaY(rows, { x: "date", y1: "c25", y2: "c75", fill: seriesColour(0), fillOpacity: 0.55, curve: "step-after" }),
          Plot.lineY(rows, { x: "date", y: "c50", stroke: seriesColour(0), strokeWidth: 1.6, curve: "step-after" }),
          Plot.dot(rows, { x: "date", y: "observed", r: 1.6, fill: tokenColour("ink-900"), fillOpacity: 0.7 }),
          Plot.ruleY([0], { stroke: tokenColour("ink-500") }),
        ],
      }),
    [holdoutStart, rows],
  );
  return (
    <PlotFigure
      title={`Weekly contribution of ${sheet.channel.name} against the baseline`}
      caption={
        <>
          Blue: new customers per week the model credits to {sheet.channel.name} (line: median; bands: 50 % and 90 %). Grey: the baseline, what the cell
          would gain with no media at all (dashed: median; band: 90 %). Dots: the observed new customers.
          {holdoutStart ? ` Shaded weeks from ${formatWeek(c.weeks[rows.findIndex((row) => !row.fitted)]!)} were held out of the fit.` : ""}
        </>
      }
      render={render}
      table={{
        caption: `Weekly contribution of ${sheet.channel.name} and the baseline`,
        columns: ["Week", "Spend", "Observed", "Contribution median", "Contribution 5 %", "Contribution 95 %", "Baseline median", "Fitted"],
        rows: c.weeks.map((week, t) => [week, r(c.spend[t]), r(c.observed[t]), r(c.contribution.q50[t]), r(c.contribution.q05[t]), r(c.contribution.q95[t]), r(c.baseline.q50[t]), c.fitted[t] ? "yes" : "held out"]),
      }}
    />
  );
}

// ---------------------------------------------------------------------------------

type EstimateRow = { key: string; label: string; interval: CacInterval };

/** The pooled estimate beside the cell's own (no pooling) and its group's, with an arrow for the move. */
export function PoolingComparisonChart({ sheet }: { sheet: ChannelSheet }) {
  const { pooled, unpooled, group } = sheet.estimates;
  const rows = useMemo<EstimateRow[]>(
    () =>
      [
        unpooled ? { key: "unpooled", label: "Own data only", interval: unpooled } : null,
        { key: "pooled", label: "Pooled", interval: pooled },
        group ? { key: "group", label: "Group", interval: group } : null,
      ].filter((row): row is EstimateRow => row !== null),
    [group, pooled, unpooled],
  );
  const render = useCallback(
    (width: number) => {
      const values = rows.flatMap((row) => [row.interval.q05, row.interval.q95]);
      const flat = rows.map((row) => ({ key: row.key, ...row.interval }));
      return Plot.plot({
        width,
        height: 70 + rows.length * 40,
        marginLeft: 100,
        marginRight: 20,
        marginBottom: 40,
        x: { type: "log", domain: [Math.min(...values) / 1.15, Math.max(...values) * 1.15], label: `Low-spend cost per new customer (${sheet.currency}, log scale) →`, grid: true, tickFormat: compactNumber },
        y: { domain: rows.map((row) => row.key), tickFormat: (key: string) => rows.find((row) => row.key === key)?.label ?? key, label: null, padding: 0.4 },
        marks: [
          Plot.ruleY(flat, { y: "key", x1: "q05", x2: "q95", stroke: (d: { key: string }) => (d.key === "pooled" ? tokenColour("stream-700") : tokenColour("ink-400")), strokeWidth: 3 }),
          Plot.dot(flat, { y: "key", x: "q50", r: 5, fill: (d: { key: string }) => (d.key === "pooled" ? tokenColour("stream-800") : "white"), stroke: tokenColour("ink-900"), symbol: (d: { key: string }) => (d.key === "group" ? "diamond" : "circle") }),
          ...(unpooled
            ? [Plot.arrow([{ x1: unpooled.q50, x2: pooled.q50 }], { x1: "x1", x2: "x2", y1: () => "unpooled", y2: () => "pooled", stroke: tokenColour("silt-700"), strokeWidth: 1.5, insetEnd: 6, insetStart: 6 })]
            : []),
        ],
      });
    },
    [pooled.q50, rows, sheet.currency, unpooled],
  );
  return (
    <PlotFigure
      title="Pooled beside unpooled"
      caption={
        <>
          Low-spend cost per new customer: median (dot) and 90 % interval (bar) from this cell’s own data alone (no pooling), from the pooled model
          (the estimate used on every screen), and of its group (portfolio + brand + market, diamond). The arrow shows how far pooling moved the median.
          {unpooled ? "" : " This run has no no-pooling comparison."}
        </>
      }
      render={render}
      table={{
        caption: `Pooled, unpooled and group estimates (${sheet.currency})`,
        columns: ["Estimate", "5 %", "Median", "95 %"],
        rows: rows.map((row) => [row.label, r(row.interval.q05), r(row.interval.q50), r(row.interval.q95)]),
      }}
    />
  );
}
