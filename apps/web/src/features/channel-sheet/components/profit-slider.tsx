import * as Plot from "@observablehq/plot";
import type { ChannelSheet } from "@tributary/contracts";
import { useCallback, useId, useMemo, useState } from "react";
import { compactNumber } from "../../../components/chart/axis-format";
import { seriesColour, tokenColour } from "../../../components/chart/chart-colours";
import { PlotFigure } from "../../../components/chart/plot-figure";
import { chanceOfProfitCurve, chanceOfProfitSorted, sortedCacDraws } from "../../../lib/chance-of-profit";
import { formatChance, formatMoney } from "../../../lib/format";

const STEPS = 200;

/** The slider's range: a log scale from well below to well above the draws and the brand's value. */
export function sliderRange(sorted: Float64Array, customerValue: number | null): [number, number] {
  const finite = sorted.filter((value) => Number.isFinite(value) && value > 0);
  const low = finite.length > 0 ? finite[Math.floor(finite.length * 0.01)]! : (customerValue ?? 1);
  const high = finite.length > 0 ? finite[Math.min(finite.length - 1, Math.floor(finite.length * 0.99))]! : (customerValue ?? 100);
  const lo = Math.min(low, customerValue ?? low) / 2;
  const hi = Math.max(high, customerValue ?? high) * 2;
  return [Math.max(lo, 1e-6), Math.max(hi, lo * 4)];
}

/** A "nice" money value for a slider position: 2 significant digits, so labels read cleanly. */
function valueAt(step: number, [lo, hi]: [number, number]): number {
  const raw = Math.exp(Math.log(lo) + (step / STEPS) * (Math.log(hi) - Math.log(lo)));
  return Number(raw.toPrecision(2));
}

function stepOf(value: number, [lo, hi]: [number, number]): number {
  const t = (Math.log(value) - Math.log(lo)) / (Math.log(hi) - Math.log(lo));
  return Math.round(Math.min(1, Math.max(0, t)) * STEPS);
}

/** Chance of profit as the customer value moves, computed here from the run's stored draws. */
export function ProfitSlider({ sheet }: { sheet: ChannelSheet }) {
  const sliderId = useId();
  const { profit, currency } = sheet;
  const sorted = useMemo(() => sortedCacDraws(profit.draws), [profit.draws]);
  const range = useMemo(() => sliderRange(sorted, profit.customerValue), [profit.customerValue, sorted]);
  const [step, setStep] = useState(() => stepOf(profit.customerValue ?? sheet.lowSpendCac.summary.q50, range));
  // At the start, the slider sits at exactly the brand's value (not its rounded step).
  const [exact, setExact] = useState<number | null>(profit.customerValue);
  const value = exact ?? valueAt(step, range);
  // At the brand's own value the server's figure (from every stored draw, as on the other
  // screens) is shown; elsewhere the chance is counted here from the thinned draws.
  const atBrandValue = profit.customerValue !== null && value === profit.customerValue && profit.probabilityAtCustomerValue !== null;
  const chance = atBrandValue ? profit.probabilityAtCustomerValue : chanceOfProfitSorted(sorted, value);

  const curve = useMemo(
    () => chanceOfProfitCurve(sorted, Array.from({ length: 81 }, (_, i) => Math.exp(Math.log(range[0]) + (i / 80) * (Math.log(range[1]) - Math.log(range[0]))))),
    [range, sorted],
  );
  const render = useCallback(
    (width: number) =>
      Plot.plot({
        width,
        height: 240,
        marginLeft: 56,
        marginRight: 20,
        marginBottom: 40,
        x: { type: "log", domain: range, label: `Value of a new customer (${currency}, log scale) →`, grid: true, tickFormat: compactNumber },
        y: { domain: [0, 1], label: "↑ Chance of profit", tickFormat: (v: number) => `${Math.round(v * 100)} %`, grid: true },
        marks: [
          Plot.lineY(curve, { x: "customerValue", y: "chance", stroke: seriesColour(0), strokeWidth: 2 }),
          ...(profit.customerValue ? [Plot.ruleX([profit.customerValue], { stroke: tokenColour("silt-500"), strokeWidth: 2, strokeDasharray: "5 3" })] : []),
          ...(chance !== null ? [Plot.dot([{ x: value, y: chance }], { x: "x", y: "y", r: 6, fill: tokenColour("ink-900"), stroke: "white", strokeWidth: 1.5 })] : []),
          Plot.ruleY([0], { stroke: tokenColour("ink-500") }),
        ],
      }),
    [chance, curve, currency, profit.customerValue, range, value],
  );

  if (sorted.length === 0) {
    return <p className="text-small text-ink-700">This channel has no spend in the recent weeks of this cell, so its chance of profit is not defined.</p>;
  }
  return (
    <div className="space-y-4">
      <div className="rounded-lg border border-line bg-ink-50 px-4 py-3">
        <label htmlFor={sliderId} className="block text-small font-medium text-ink-800">
          Value of a new customer: <span className="tabular-nums text-ink-950">{formatMoney(value, currency)}</span>
          {profit.customerValue && value === profit.customerValue ? <span className="font-normal text-ink-600"> (the brand’s value)</span> : null}
        </label>
        <input
          id={sliderId}
          type="range"
          min={0}
          max={STEPS}
          step={1}
          value={exact !== null ? stepOf(exact, range) : step}
          aria-valuetext={formatMoney(value, currency)}
          onChange={(event) => {
            setExact(null);
            setStep(Number(event.target.value));
          }}
          className="mt-2 w-full accent-stream-700"
        />
        <div className="flex justify-between text-caption text-ink-600" aria-hidden="true">
          <span>{formatMoney(range[0], currency)}</span>
          <span>{formatMoney(range[1], currency)}</span>
        </div>
        <p className="mt-2 text-body text-ink-900" aria-live="polite" data-testid="profit-readout">
          At {formatMoney(value, currency)} per customer, the chance of profit is <strong className="font-semibold tabular-nums">{formatChance(chance)}</strong>{" "}
          <span className="text-small text-ink-700">
            ({profit.basis.label}; {atBrandValue ? "from every stored posterior draw" : `counted from ${sorted.length} posterior draws`})
          </span>
        </p>
        {profit.customerValue ? (
          <button type="button" className="mt-1 text-small font-medium text-stream-700 underline" onClick={() => setExact(profit.customerValue)}>
            Back to the brand’s value ({formatMoney(profit.customerValue, currency)})
          </button>
        ) : null}
      </div>
      <PlotFigure
        title="Chance of profit by customer value"
        caption={
          <>
            The share of posterior draws whose cost per new customer ({profit.basis.label}) is below the value of a customer, for every value on the
            axis. Dot: the value chosen above; dashed ochre line: the brand’s customer value.
          </>
        }
        render={render}
        table={{
          caption: `Chance of profit by customer value (${currency})`,
          columns: ["Customer value", "Chance of profit"],
          rows: curve.map((point) => [Number(point.customerValue.toPrecision(3)), point.chance === null ? null : Number(point.chance.toFixed(3))]),
        }}
      />
    </div>
  );
}
