import * as Plot from "@observablehq/plot";
import { flagKindLabels, type BrandComparison } from "@tributary/contracts";
import { useCallback } from "react";
import { compactNumber } from "../../../components/chart/axis-format";
import { seriesColour, tokenColour } from "../../../components/chart/chart-colours";
import { PlotFigure } from "../../../components/chart/plot-figure";
import { formatCac } from "../../../lib/format";
import { lineLabel, type ComparisonLine } from "./comparison-rows";

type Reference = BrandComparison["channels"][number];

const round = (value: number) => Number(value.toPrecision(4));
// Pixels per row: the chart's inner height is exactly rows × ROW_STEP.
const ROW_STEP = 24;

/** Log-axis limits that hold every interval and the reference band. */
function domainOf(lines: ComparisonLine[], reference: Reference): [number, number] {
  const values = [reference.portfolioEffect.q05, reference.portfolioEffect.q95, ...lines.flatMap((line) => [line.interval.q05, line.interval.q95])].filter((v) => v > 0 && Number.isFinite(v));
  const lo = Math.min(...values);
  const hi = Math.max(...values);
  return [lo / 1.15, hi * 1.6];
}

/** One channel: every brand's interval (and its cells') on a log cost axis, over the portfolio's band. */
export function ChannelComparisonChart({ reference, lines, currency }: { reference: Reference; lines: ComparisonLine[]; currency: string }) {
  const render = useCallback(
    (width: number) => {
      const band = reference.portfolioEffect;
      const labels = new Map(lines.map((line) => [line.key, lineLabel(line)]));
      const rows = lines.map((line) => ({
        key: line.key,
        kind: line.kind,
        q05: line.interval.q05,
        q25: line.interval.q25,
        q50: line.interval.q50,
        q75: line.interval.q75,
        q95: line.interval.q95,
        colour: seriesColour(line.brandIndex),
        note: [line.outlier ? "outlier?" : null, ...line.flags.map((flag) => `flagged: ${flagKindLabels[flag.kind].toLowerCase()}`)].filter(Boolean).join(" · "),
      }));
      const brandRows = rows.filter((row) => row.kind === "brand");
      // A thin line above each brand's first row (after the first brand) keeps the groups apart.
      const groupStarts = lines.filter((line, i) => i > 0 && line.brandId !== lines[i - 1]!.brandId).map((line) => line.key);
      const cellRows = rows.filter((row) => row.kind === "cell");
      return Plot.plot({
        width,
        height: 56 + lines.length * ROW_STEP,
        marginLeft: 190,
        marginRight: 24,
        marginTop: 16,
        marginBottom: 40,
        style: { fontSize: "12px" },
        x: { type: "log", domain: domainOf(lines, reference), label: `Cost per new customer at low spend (${currency}, log scale) →`, grid: true, tickFormat: compactNumber },
        y: { domain: lines.map((line) => line.key), tickFormat: (key: string) => labels.get(key) ?? key, label: null, padding: 0.35 },
        marks: [
          // The portfolio's channel effect: a band (90 %) and a dashed median behind every row.
          Plot.rectX([band], { x1: "q05", x2: "q95", fill: tokenColour("silt-300"), fillOpacity: 0.35 }),
          Plot.ruleX([band.q50], { stroke: tokenColour("silt-500"), strokeWidth: 1.5, strokeDasharray: "5 3" }),
          Plot.ruleY(groupStarts, { y: (key: string) => key, dy: -ROW_STEP / 2, stroke: tokenColour("ink-300"), strokeWidth: 1 }),
          Plot.ruleY(brandRows, { y: "key", x1: "q05", x2: "q95", stroke: "colour", strokeWidth: 7, strokeOpacity: 0.45 }),
          Plot.tickX(brandRows, { y: "key", x: "q50", stroke: tokenColour("ink-900"), strokeWidth: 2.5 }),
          Plot.ruleY(cellRows, { y: "key", x1: "q05", x2: "q95", stroke: "colour", strokeWidth: 2 }),
          Plot.ruleY(
            cellRows.filter((row) => row.q25 !== null && row.q75 !== null),
            { y: "key", x1: "q25", x2: "q75", stroke: "colour", strokeWidth: 5 },
          ),
          Plot.dot(cellRows, { y: "key", x: "q50", r: 3.5, fill: tokenColour("ink-900"), stroke: "white", strokeWidth: 1 }),
          Plot.text(
            rows.filter((row) => row.note !== ""),
            { y: "key", x: "q95", text: "note", dx: 8, textAnchor: "start", fill: tokenColour("caution-700"), fontWeight: 600 },
          ),
        ],
      });
    },
    [currency, lines, reference],
  );
  const band = reference.portfolioEffect;
  return (
    <PlotFigure
      title={reference.name}
      caption={
        <>
          Each row: median (dot) with 50 % (thick) and 90 % (thin) intervals of the low-spend cost per new customer; a wide
          pale bar with a dark tick is a brand’s own effect across its markets. The ochre band is the portfolio-wide effect of{" "}
          {reference.name} ({formatCac(band.q50, currency)}, 90 %: {formatCac(band.q05, currency)}–{formatCac(band.q95, currency)}).
          Log scale: equal steps are equal ratios.
        </>
      }
      render={render}
      table={{
        caption: `Low-spend cost per new customer, ${reference.name} (${currency})`,
        columns: ["Row", "5 %", "Median", "95 %", "Notes"],
        rows: [
          ["Portfolio-wide effect", round(band.q05), round(band.q50), round(band.q95), null],
          ...lines.map((line) => [
            lineLabel(line),
            round(line.interval.q05),
            round(line.interval.q50),
            round(line.interval.q95),
            [line.outlier ? "candidate outlier" : null, ...line.flags.map((flag) => `flagged: ${flagKindLabels[flag.kind]}`)].filter(Boolean).join("; ") || null,
          ]),
        ],
      }}
    />
  );
}
