import * as Plot from "@observablehq/plot";
import { useCallback, useId, useMemo, useState } from "react";
import { compactNumber } from "../../../components/chart/axis-format";
import { seriesColour, tokenColour } from "../../../components/chart/chart-colours";
import { PlotFigure } from "../../../components/chart/plot-figure";
import { inputClass } from "../../../components/ui/field";
import type { ChannelName } from "../../../lib/channel-names";
import { formatMoney, formatNumber } from "../../../lib/format";
import type { SplitView } from "../split/split-view";

type Grouping = "channel" | "cell" | "line";
const MAX_LINES_IN_CHART = 40;

const r = (x: number) => Math.round(x);

/** The allocation against the current spend, summed by channel or by cell, or line by line. */
export function AllocationChart({ view, currency, channelName }: { view: SplitView; currency: string; channelName: ChannelName }) {
  const selectId = useId();
  const [grouping, setGrouping] = useState<Grouping>("channel");
  const rows = useMemo(() => {
    // Summed by the channel's code and the cell's id; shown under the channel's display name.
    const group = (line: SplitView["lines"][number]) =>
      grouping === "channel"
        ? { key: line.channel, name: channelName(line.channel) }
        : grouping === "cell"
          ? { key: line.cellId, name: `${line.brand} in ${line.market}` }
          : { key: line.key, name: `${channelName(line.channel)} · ${line.brand} in ${line.market}` };
    const sums = new Map<string, { name: string; allocation: number; current: number }>();
    for (const line of view.lines) {
      const { key, name } = group(line);
      const row = sums.get(key) ?? { name, allocation: 0, current: 0 };
      row.allocation += line.allocation;
      row.current += line.current;
      sums.set(key, row);
    }
    return [...sums.values()];
  }, [channelName, grouping, view.lines]);
  const render = useCallback(
    (width: number) => {
      return Plot.plot({
        width,
        height: Math.max(140, rows.length * 30 + 60),
        marginLeft: Math.min(260, 12 + 7 * Math.max(...rows.map((row) => row.name.length), 6)),
        x: { label: `Spend over ${view.horizon} weeks (${currency})`, grid: true, tickFormat: compactNumber },
        y: { label: null, domain: rows.map((row) => row.name) },
        marks: [
          // The current spend as a wide grey bar, the split as a narrower blue bar over it.
          Plot.barX(rows, { x: "current", y: "name", fill: tokenColour("ink-300"), insetTop: 2, insetBottom: 2 }),
          Plot.barX(rows, { x: "allocation", y: "name", fill: seriesColour(0), insetTop: 8, insetBottom: 8 }),
          Plot.ruleX([0], { stroke: tokenColour("ink-500") }),
        ],
      });
    },
    [currency, rows, view.horizon],
  );
  return (
    <div className="space-y-2">
      <div>
        <label htmlFor={selectId} className="text-small font-medium text-ink-800">
          Show spend by
        </label>
        <select id={selectId} className={`${inputClass} ml-2 inline-block w-40`} value={grouping} onChange={(event) => setGrouping(event.target.value as Grouping)}>
          <option value="channel">channel</option>
          <option value="cell">cell</option>
          <option value="line" disabled={view.lines.length > MAX_LINES_IN_CHART}>
            line{view.lines.length > MAX_LINES_IN_CHART ? " (too many)" : ""}
          </option>
        </select>
      </div>
      <SplitBars render={render} rows={rows} currency={currency} horizon={view.horizon} grouping={grouping} />
    </div>
  );
}

function SplitBars({ render, rows, currency, horizon, grouping }: { render: (width: number) => Element; rows: { name: string; allocation: number; current: number }[]; currency: string; horizon: number; grouping: Grouping }) {
  return (
    <PlotFigure
      title={`The split against the current spend, by ${grouping}`}
      caption={`Spend over ${horizon} weeks in ${currency}: wide grey bars at the current weekly spend, narrow blue bars as split.`}
      render={render}
      table={{
        caption: `Spend over ${horizon} weeks by ${grouping}, current and split (${currency})`,
        columns: [grouping === "channel" ? "Channel" : grouping === "cell" ? "Cell" : "Line", "Current", "Split", "Change"],
        rows: rows.map((row) => [row.name, r(row.current), r(row.allocation), r(row.allocation - row.current)]),
      }}
    >
      <ul className="mt-1 flex gap-4 text-small text-ink-800" aria-label="Legend">
        <li className="flex items-center gap-2">
          <span className="inline-block h-3 w-3 rounded-sm" style={{ background: tokenColour("ink-300") }} aria-hidden="true" />
          Current spend ({formatMoney(rows.reduce((a, row) => a + row.current, 0), currency)})
        </li>
        <li className="flex items-center gap-2">
          <span className="inline-block h-3 w-3 rounded-sm" style={{ background: seriesColour(0) }} aria-hidden="true" />
          Split ({formatMoney(rows.reduce((a, row) => a + row.allocation, 0), currency)})
        </li>
      </ul>
    </PlotFigure>
  );
}

/** The distribution of the objective over the posterior draws: the split against the current spend, on shared bins. */
export function OutcomeHistogram({ view, currency }: { view: SplitView; currency: string }) {
  const what = view.objective === "profit" ? `Profit over ${view.horizon} weeks (${currency})` : `New customers over ${view.horizon} weeks`;
  const bins = useMemo(() => {
    const rows: { plan: string; x1: number; x2: number; count: number }[] = [];
    for (const [plan, outcome] of [
      ["Current spend", view.outcome.current],
      ["Split", view.outcome.allocation],
    ] as const) {
      outcome.counts.forEach((count, i) => rows.push({ plan, x1: outcome.edges[i]!, x2: outcome.edges[i + 1]!, count }));
    }
    return rows;
  }, [view.outcome]);
  const render = useCallback(
    (width: number) =>
      Plot.plot({
        width,
        height: 260,
        marginLeft: 50,
        x: { label: what, tickFormat: compactNumber },
        y: { label: "Posterior draws", grid: true },
        color: { domain: ["Current spend", "Split"], range: [tokenColour("ink-500"), seriesColour(0)] },
        marks: [
          Plot.rectY(bins, { x1: "x1", x2: "x2", y: "count", fill: "plan", fillOpacity: 0.45, inset: 0.5 }),
          Plot.ruleX([view.outcome.current.q50], { stroke: tokenColour("ink-700"), strokeWidth: 2, strokeDasharray: "4 3" }),
          Plot.ruleX([view.outcome.allocation.q50], { stroke: seriesColour(0), strokeWidth: 2 }),
          Plot.ruleY([0]),
        ],
      }),
    [bins, view.outcome, what],
  );
  return (
    <PlotFigure
      title={`How the ${view.objective === "profit" ? "profit" : "new customers"} could turn out`}
      caption={`${what} over the posterior draws: grey for the current spend, blue for the split, on the same bins; vertical lines at the medians (dashed: current). Median ${formatNumber(view.outcome.allocation.q50, 4)} against ${formatNumber(view.outcome.current.q50, 4)}; 90 % intervals ${formatNumber(view.outcome.allocation.q05, 3)} to ${formatNumber(view.outcome.allocation.q95, 3)} against ${formatNumber(view.outcome.current.q05, 3)} to ${formatNumber(view.outcome.current.q95, 3)}.`}
      render={render}
      table={{
        caption: `${what}: posterior draws per bin, current spend and split`,
        columns: ["Plan", "From", "To", "Draws"],
        rows: bins.map((bin) => [bin.plan, Number(bin.x1.toPrecision(5)), Number(bin.x2.toPrecision(5)), bin.count]),
      }}
    />
  );
}
