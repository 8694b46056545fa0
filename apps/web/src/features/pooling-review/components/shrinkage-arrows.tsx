import * as Plot from "@observablehq/plot";
import type { Flag, PoolingReview } from "@tributary/contracts";
import { useCallback, useMemo } from "react";
import { compactNumber } from "../../../components/chart/axis-format";
import { seriesColour, tokenColour } from "../../../components/chart/chart-colours";
import { PlotFigure } from "../../../components/chart/plot-figure";
import { flagKindShortLabels } from "../../../components/estimate/flag-badge";

type ReviewRow = PoolingReview["rows"][number];

const round = (value: number | null | undefined) => (value === null || value === undefined ? null : Number(value.toPrecision(4)));
const percent = (value: number | null) => (value === null ? "–" : `${Math.round(value * 100)} %`);

export const rowKey = (row: Pick<ReviewRow, "cellId" | "channel">) => `${row.cellId}|${row.channel}`;
export const rowLabel = (row: Pick<ReviewRow, "brand" | "market" | "channelName">) => `${row.brand} · ${row.market} · ${row.channelName}`;

type ShrinkageArrowsProps = {
  rows: ReviewRow[];
  /** Channel codes in display order, for their colours. */
  channelOrder: string[];
  flagsById: Map<string, Flag>;
  currency: string;
};

/** Every cell × channel as an arrow from its unpooled to its pooled median on a log axis, largest shrinkage on top. */
export function ShrinkageArrows({ rows, channelOrder, flagsById, currency }: ShrinkageArrowsProps) {
  const data = useMemo(
    () =>
      rows.map((row) => ({
        key: rowKey(row),
        label: rowLabel(row),
        from: row.unpooled?.q50 ?? null,
        to: row.pooled.q50,
        group: row.group?.q50 ?? null,
        colour: seriesColour(Math.max(0, channelOrder.indexOf(row.channel))),
        outlier: row.outlier,
        note: [
          percent(row.pooling.shrinkage),
          row.outlier ? "outlier?" : null,
          ...row.flagIds.map((id) => flagsById.get(id)).filter((flag): flag is Flag => flag !== undefined).map((flag) => `flag: ${flagKindShortLabels[flag.kind]}`),
        ]
          .filter(Boolean)
          .join(" · "),
      })),
    [channelOrder, flagsById, rows],
  );
  const render = useCallback(
    (width: number) => {
      const values = data.flatMap((d) => [d.from, d.to, d.group]).filter((v): v is number => v !== null && v > 0);
      const labels = new Map(data.map((d) => [d.key, d.label]));
      const withArrow = data.filter((d) => d.from !== null);
      return Plot.plot({
        width,
        height: 60 + data.length * 17,
        marginLeft: 230,
        marginRight: 190,
        marginBottom: 40,
        style: { fontSize: "11px" },
        x: { type: "log", domain: [Math.min(...values) / 1.2, Math.max(...values) * 1.2], label: `Low-spend cost per new customer (${currency}, log scale) →`, grid: true, tickFormat: compactNumber },
        y: { domain: data.map((d) => d.key), tickFormat: (key: string) => labels.get(key) ?? key, label: null, padding: 0.2 },
        marks: [
          Plot.dot(withArrow, { y: "key", x: "from", r: 3, stroke: "colour", fill: "white", strokeWidth: 1.5 }),
          Plot.arrow(withArrow, { y1: "key", y2: "key", x1: "from", x2: "to", stroke: "colour", strokeWidth: (d: { outlier: boolean }) => (d.outlier ? 2.6 : 1.6), headLength: 7, insetStart: 3 }),
          Plot.dot(data.filter((d) => d.from === null), { y: "key", x: "to", r: 3, fill: "colour" }),
          Plot.dot(data.filter((d) => d.group !== null), { y: "key", x: "group", symbol: "diamond", r: 3.5, stroke: tokenColour("ink-900"), fill: "none", strokeWidth: 1.2 }),
          Plot.text(data, { y: "key", frameAnchor: "right", dx: 186, textAnchor: "end", text: "note", fill: (d: { outlier: boolean }) => (d.outlier ? tokenColour("caution-700") : tokenColour("ink-700")) }),
        ],
      });
    },
    [currency, data],
  );
  const legend = channelOrder
    .map((code, index) => ({ code, index, name: rows.find((row) => row.channel === code)?.channelName }))
    .filter((entry): entry is { code: string; index: number; name: string } => entry.name !== undefined);
  return (
    <PlotFigure
      title="How far pooling moved each estimate"
      caption={
        <>
          Each row is one cell × channel, largest shrinkage first. The arrow runs from the cell’s own estimate (open circle: fitted on its data alone) to the
          pooled estimate (arrow head); the hollow diamond marks its group (portfolio + brand + market). All medians of the low-spend cost per new
          customer, on a log scale. On the right: shrinkage (0 % not moved, 100 % all the way to the group), candidate outliers and flags. Colours tell the
          channels apart; thicker arrows are candidate outliers.
        </>
      }
      render={render}
      legend={
        <ul aria-label="Channel colours" className="flex flex-wrap gap-x-4 gap-y-1 text-caption text-ink-800">
          {legend.map((entry) => (
            <li key={entry.code} className="inline-flex items-center gap-1.5">
              <svg viewBox="0 0 22 8" className="h-2 w-5.5" aria-hidden="true">
                <path d="M1 4h15" stroke={seriesColour(entry.index)} strokeWidth="2" />
                <path d="M15 1l5 3-5 3z" fill={seriesColour(entry.index)} />
              </svg>
              {entry.name}
            </li>
          ))}
          <li className="inline-flex items-center gap-1.5">
            <svg viewBox="0 0 10 10" className="h-2.5 w-2.5" aria-hidden="true">
              <path d="M5 1 9 5 5 9 1 5Z" fill="none" stroke="currentColor" strokeWidth="1.3" />
            </svg>
            group estimate
          </li>
        </ul>
      }
      table={{
        caption: `Unpooled, pooled and group medians of the low-spend cost per new customer (${currency})`,
        columns: ["Cell × channel", "No pooling", "Pooled", "Group", "Notes"],
        rows: data.map((d) => [d.label, round(d.from), round(d.to), round(d.group), d.note]),
      }}
    />
  );
}
