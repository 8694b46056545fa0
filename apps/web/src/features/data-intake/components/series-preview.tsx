import * as Plot from "@observablehq/plot";
import type { CellSeriesPreview } from "@tributary/contracts";
import { useCallback, useId, useMemo, useState } from "react";
import { seriesColours, tokenColour } from "../../../components/chart/chart-colours";
import { compactNumber } from "../../../components/chart/axis-format";
import { PlotFigure } from "../../../components/chart/plot-figure";
import { inputClass } from "../../../components/ui/field";
import { formatWeek } from "../../../lib/format";

type SeriesPreviewProps = {
  series: CellSeriesPreview[];
  channels: string[];
  currency: string;
  /** The outcome column's name, for the axis (e.g. new_customers). */
  outcomeName: string;
};

const weekDate = (iso: string) => new Date(`${iso}T00:00:00Z`);

function cellLabel(cell: { brand: string; market: string }): string {
  return `${cell.brand} in ${cell.market}`;
}

/** Weekly spend stacked by channel over the weekly outcome, for one cell of an upload. */
export function SeriesPreview({ series, channels, currency, outcomeName }: SeriesPreviewProps) {
  const selectId = useId();
  const [selected, setSelected] = useState(0);
  const cell = series[Math.min(selected, series.length - 1)];
  const outcomeLabel = outcomeName.replace(/_/g, " ");

  const spendRows = useMemo(
    () =>
      cell
        ? cell.weeks.flatMap((week, t) =>
            channels.map((channel, c) => ({ date: weekDate(week), channel, spend: cell.spend[c]?.[t] ?? null })),
          )
        : [],
    [cell, channels],
  );
  const outcomeRows = useMemo(
    () => (cell ? cell.weeks.map((week, t) => ({ date: weekDate(week), outcome: cell.outcome[t] ?? null })) : []),
    [cell],
  );

  const render = useCallback(
    (width: number) => {
      const palette = seriesColours();
      const holder = document.createElement("div");
      const xDomain = outcomeRows.length > 0 ? [outcomeRows[0]!.date, outcomeRows[outcomeRows.length - 1]!.date] : undefined;
      holder.append(
        Plot.plot({
          width,
          height: 240,
          marginLeft: 64,
          x: { type: "utc", domain: xDomain, label: null },
          y: { label: `Spend per week (${currency})`, grid: true, tickFormat: compactNumber },
          color: { legend: true, domain: channels, range: palette },
          marks: [
            Plot.areaY(spendRows, { x: "date", y: (d: { spend: number | null }) => d.spend ?? 0, fill: "channel", order: channels, curve: "step-after" }),
            Plot.ruleY([0], { stroke: tokenColour("ink-500") }),
          ],
        }),
        Plot.plot({
          width,
          height: 180,
          marginLeft: 64,
          x: { type: "utc", domain: xDomain, label: "Week" },
          y: { label: `${outcomeLabel} per week`, grid: true, tickFormat: compactNumber, zero: true },
          marks: [
            Plot.lineY(outcomeRows, { x: "date", y: "outcome", stroke: tokenColour("ink-900"), strokeWidth: 1.6 }),
            Plot.ruleY([0], { stroke: tokenColour("ink-500") }),
          ],
        }),
      );
      return holder;
    },
    [channels, currency, outcomeLabel, outcomeRows, spendRows],
  );

  if (!cell) return null;
  const first = cell.weeks[0];
  const last = cell.weeks[cell.weeks.length - 1];
  return (
    <section aria-label="Preview" className="space-y-3">
      <div className="flex flex-wrap items-end gap-3">
        <div>
          <label htmlFor={selectId} className="block text-small font-medium text-ink-800">
            Cell to preview
          </label>
          <select id={selectId} className={`${inputClass} mt-1 w-80 max-w-full`} value={selected} onChange={(event) => setSelected(Number(event.target.value))}>
            {series.map((item, i) => (
              <option key={`${item.brand}|${item.market}`} value={i}>
                {cellLabel(item)} ({item.weeks.length} weeks)
              </option>
            ))}
          </select>
        </div>
      </div>
      <PlotFigure
        title={`${cellLabel(cell)}: spend and ${outcomeLabel}`}
        caption={
          <>
            Top: spend per week on each channel, stacked, in {currency}. Bottom: {outcomeLabel} per week. {cell.weeks.length} weeks
            {first && last ? ` from ${formatWeek(first)} to ${formatWeek(last)}` : ""}. Values that are not numbers are drawn as zero spend or
            left out of the line.
          </>
        }
        render={render}
        table={{
          caption: `Weekly spend by channel (${currency}) and ${outcomeLabel}, ${cellLabel(cell)}`,
          columns: ["Week", ...channels.map((channel) => `Spend on ${channel} (${currency})`), outcomeLabel],
          rows: cell.weeks.map((week, t) => [week, ...channels.map((_, c) => cell.spend[c]?.[t] ?? null), cell.outcome[t] ?? null]),
        }}
      />
    </section>
  );
}
