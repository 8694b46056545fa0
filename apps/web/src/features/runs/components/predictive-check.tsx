import * as Plot from "@observablehq/plot";
import type { PredictiveCheckCell } from "@tributary/contracts";
import { useCallback, useId, useMemo, useState } from "react";
import { tokenColour } from "../../../components/chart/chart-colours";
import { compactNumber } from "../../../components/chart/axis-format";
import { PlotFigure } from "../../../components/chart/plot-figure";
import { DataTable, type DataTableColumn } from "../../../components/data-table/data-table";
import { inputClass } from "../../../components/ui/field";
import { formatNumber, formatWeek } from "../../../lib/format";

const weekDate = (iso: string) => new Date(`${iso}T00:00:00Z`);
const percent = (share: number) => `${formatNumber(share * 100, 3)} %`;

function CellChart({ cell, outcomeLabel }: { cell: PredictiveCheckCell; outcomeLabel: string }) {
  const rows = useMemo(
    () =>
      cell.weeks.map((week, t) => ({
        date: weekDate(week),
        observed: cell.observed[t] ?? null,
        q05: cell.q05[t] ?? null,
        q25: cell.q25[t] ?? null,
        q50: cell.q50[t] ?? null,
        q75: cell.q75[t] ?? null,
        q95: cell.q95[t] ?? null,
      })),
    [cell],
  );
  const holdout = cell.holdoutFrom ? weekDate(cell.holdoutFrom) : null;
  const render = useCallback(
    (width: number) =>
      Plot.plot({
        width,
        height: 300,
        marginLeft: 64,
        x: { type: "utc", label: "Week" },
        y: { label: `${outcomeLabel} per week`, grid: true, tickFormat: compactNumber },
        marks: [
          Plot.areaY(rows, { x: "date", y1: "q05", y2: "q95", fill: tokenColour("stream-200"), fillOpacity: 0.75, curve: "step-after" }),
          Plot.areaY(rows, { x: "date", y1: "q25", y2: "q75", fill: tokenColour("stream-500"), fillOpacity: 0.55, curve: "step-after" }),
          Plot.lineY(rows, { x: "date", y: "q50", stroke: tokenColour("stream-700"), strokeWidth: 1.2, curve: "step-after" }),
          Plot.dot(rows, { x: "date", y: "observed", r: 1.8, fill: tokenColour("ink-900") }),
          ...(holdout ? [Plot.ruleX([holdout], { stroke: tokenColour("silt-500"), strokeWidth: 2, strokeDasharray: "5 3" })] : []),
        ],
      }),
    [holdout, outcomeLabel, rows],
  );
  return (
    <PlotFigure
      title={`${cell.brand} in ${cell.market}: observed against replicated ${outcomeLabel}`}
      caption={
        <>
          Dots: observed {outcomeLabel} per week. Shaded: the weekly values the fitted model replicates (light: 90 % band, darker: 50 % band, line: median).
          {holdout ? ` Weeks after the dashed line (from ${formatWeek(cell.holdoutFrom!)}) were held out of the fit.` : ""} {percent(cell.coverage90)} of the fitted
          weeks lie inside the 90 % band; close to 90 % is what a sound model gives.
        </>
      }
      render={render}
      table={{
        caption: `Observed and replicated ${outcomeLabel} per week, ${cell.brand} in ${cell.market}`,
        columns: ["Week", "Observed", "5 %", "25 %", "Median", "75 %", "95 %"],
        rows: cell.weeks.map((week, t) => [week, cell.observed[t] ?? null, r(cell.q05[t]), r(cell.q25[t]), r(cell.q50[t]), r(cell.q75[t]), r(cell.q95[t])]),
      }}
    />
  );
}

const r = (value: number | undefined) => (value === undefined ? null : Number(value.toPrecision(4)));

const coverageColumns: DataTableColumn<PredictiveCheckCell>[] = [
  { id: "cell", header: "Cell", value: (row) => `${row.brand} in ${row.market}` },
  { id: "weeks", header: "Weeks", value: (row) => row.weeks.length, align: "end" },
  { id: "coverage", header: "Fitted weeks inside the 90 % band", value: (row) => Number(row.coverage90.toFixed(4)), cell: (row) => percent(row.coverage90), align: "end" },
];

/** Posterior predictive check per cell: observed weeks against the model's replicated bands. */
export function PredictiveCheck({ cells, outcomeLabel }: { cells: PredictiveCheckCell[]; outcomeLabel: string }) {
  const selectId = useId();
  const [selected, setSelected] = useState(0);
  const cell = cells[Math.min(selected, cells.length - 1)];
  if (!cell) return <p className="text-small text-ink-700">This run has no posterior predictive check.</p>;
  return (
    <div className="space-y-4">
      <div>
        <label htmlFor={selectId} className="block text-small font-medium text-ink-800">
          Cell
        </label>
        <select id={selectId} className={`${inputClass} mt-1 w-80 max-w-full`} value={Math.min(selected, cells.length - 1)} onChange={(event) => setSelected(Number(event.target.value))}>
          {cells.map((c, i) => (
            <option key={c.cellId} value={i}>
              {c.brand} in {c.market}
            </option>
          ))}
        </select>
      </div>
      <CellChart cell={cell} outcomeLabel={outcomeLabel} />
      <DataTable caption="Band coverage per cell" rows={cells} columns={coverageColumns} rowKey={(row) => row.cellId} csvFileName="predictive-check-coverage.csv" initialSort={{ id: "coverage" }} />
    </div>
  );
}
