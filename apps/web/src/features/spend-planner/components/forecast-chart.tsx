import * as Plot from "@observablehq/plot";
import { useCallback, useMemo } from "react";
import { compactNumber } from "../../../components/chart/axis-format";
import { seriesColour, tokenColour } from "../../../components/chart/chart-colours";
import { PlotFigure } from "../../../components/chart/plot-figure";
import { formatWeek } from "../../../lib/format";
import type { PlanWeekSummary } from "../worker/planner-api";

export type ForecastSeries = { name: string; weeks: PlanWeekSummary[] };

const r = (x: number) => Number(x.toPrecision(4));

/**
 * New customers per plan week for the selection: the current plan with its 50 % and 90 %
 * bands, each scenario as a median line with its 50 % band.
 */
export function ForecastChart({ current, scenarios, firstWeek }: { current: ForecastSeries; scenarios: ForecastSeries[]; firstWeek: string | null }) {
  const rows = useMemo(
    () =>
      [current, ...scenarios].flatMap((series, s) =>
        series.weeks.map((week) => ({
          plan: series.name,
          index: s,
          week: week.planWeek + 1,
          q05: week.outcome.q05,
          q25: week.outcome.q25,
          q50: week.outcome.q50,
          q75: week.outcome.q75,
          q95: week.outcome.q95,
        })),
      ),
    [current, scenarios],
  );
  const colours = useMemo(() => [tokenColour("ink-700"), ...scenarios.map((_, s) => seriesColour(s))], [scenarios]);
  const names = useMemo(() => [current.name, ...scenarios.map((s) => s.name)], [current, scenarios]);
  const render = useCallback(
    (width: number) => {
      const currentRows = rows.filter((row) => row.index === 0);
      const scenarioRows = rows.filter((row) => row.index > 0);
      return Plot.plot({
        width,
        height: 300,
        marginLeft: 60,
        x: { label: firstWeek ? `Plan week (week 1 starts ${formatWeek(firstWeek)})` : "Plan week", tickFormat: (w: number) => (Number.isInteger(w) ? String(w) : "") },
        y: { label: "New customers per week", grid: true, tickFormat: compactNumber },
        color: { domain: names, range: colours },
        marks: [
          Plot.areaY(currentRows, { x: "week", y1: "q05", y2: "q95", fill: tokenColour("ink-200"), fillOpacity: 0.8 }),
          Plot.areaY(currentRows, { x: "week", y1: "q25", y2: "q75", fill: tokenColour("ink-300"), fillOpacity: 0.8 }),
          Plot.areaY(scenarioRows, { x: "week", y1: "q25", y2: "q75", z: "plan", fill: "plan", fillOpacity: 0.18 }),
          Plot.lineY(rows, { x: "week", y: "q50", z: "plan", stroke: "plan", strokeWidth: 2 }),
          Plot.dot(rows, { x: "week", y: "q50", fill: "plan", r: 2.5 }),
        ],
      });
    },
    [colours, firstWeek, names, rows],
  );
  return (
    <PlotFigure
      title="New customers per week: current plan and scenarios"
      caption={
        <>
          Median forecast per plan week for all chosen cells together. Grey bands: the current plan's 50 % (darker) and 90 % intervals; coloured bands: each
          scenario's 50 % interval. Intervals include the week-to-week noise the model expects.
        </>
      }
      render={render}
      table={{
        caption: "New customers per plan week, median and intervals, per plan",
        columns: ["Plan", "Plan week", "5 %", "25 %", "Median", "75 %", "95 %"],
        rows: rows.map((row) => [row.plan, row.week, r(row.q05), r(row.q25), r(row.q50), r(row.q75), r(row.q95)]),
      }}
    >
      <ul className="mt-2 flex flex-wrap gap-4 text-small text-ink-800" aria-label="Legend">
        {names.map((name, i) => (
          <li key={`${name}-${i}`} className="flex items-center gap-2">
            <span className="inline-block h-0.5 w-5" style={{ background: colours[i] }} aria-hidden="true" />
            {name}
          </li>
        ))}
      </ul>
    </PlotFigure>
  );
}
