import * as Plot from "@observablehq/plot";
import type { ParameterTrace } from "@tributary/contracts";
import { useCallback, useMemo } from "react";
import { seriesColours, tokenColour } from "../../../components/chart/chart-colours";
import { PlotFigure } from "../../../components/chart/plot-figure";
import { formatNumber } from "../../../lib/format";

const chainName = (chain: number) => `Chain ${chain + 1}`;

function TraceChart({ trace }: { trace: ParameterTrace }) {
  const rows = useMemo(
    () => trace.chains.flatMap((chain) => chain.iterations.map((iteration, i) => ({ chain: chainName(chain.chain), iteration, value: chain.values[i] ?? null }))),
    [trace],
  );
  const chains = trace.chains.map((chain) => chainName(chain.chain));
  const render = useCallback(
    (width: number) =>
      Plot.plot({
        width,
        height: 220,
        marginLeft: 60,
        x: { label: "Draw after warm-up" },
        y: { label: "Value (the parameter's own scale)", grid: true },
        color: { legend: true, domain: chains, range: seriesColours() },
        marks: [Plot.lineY(rows, { x: "iteration", y: "value", stroke: "chain", strokeWidth: 1, strokeOpacity: 0.85 })],
      }),
    [chains, rows],
  );
  return (
    <PlotFigure
      title="Trace"
      caption={`Each chain's draws of ${trace.label} after warm-up, one line per chain (thinned for drawing). Chains that overlap like fuzz around one level have mixed; separate levels or slow drifts mean they have not.`}
      render={render}
      table={{
        caption: `Draws of ${trace.label} per chain`,
        columns: ["Chain", "Draw", "Value"],
        rows: rows.map((row) => [row.chain, row.iteration, row.value]),
      }}
    />
  );
}

function RankChart({ trace }: { trace: ParameterTrace }) {
  const rows = useMemo(
    () => trace.rankCounts.flatMap((entry) => entry.counts.map((count, bin) => ({ chain: chainName(entry.chain), bin: bin + 1, count }))),
    [trace],
  );
  const expected = useMemo(() => {
    const perChain = trace.rankCounts.map((entry) => entry.counts.reduce((a, b) => a + b, 0));
    const mean = perChain.length > 0 ? perChain.reduce((a, b) => a + b, 0) / perChain.length : 0;
    return trace.rankBins > 0 ? mean / trace.rankBins : 0;
  }, [trace]);
  const chains = trace.rankCounts.map((entry) => chainName(entry.chain));
  const render = useCallback(
    (width: number) =>
      Plot.plot({
        width,
        height: 200,
        marginLeft: 50,
        x: { label: "Rank bin (low to high)", tickFormat: (bin: number) => (bin === 1 || bin === trace.rankBins ? String(bin) : "") },
        y: { label: "Draws in bin", grid: true },
        fx: { label: null, domain: chains },
        color: { domain: chains, range: seriesColours() },
        marks: [
          Plot.barY(rows, { fx: "chain", x: "bin", y: "count", fill: "chain", inset: 0.5 }),
          Plot.ruleY([expected], { stroke: tokenColour("ink-900"), strokeDasharray: "4 3" }),
        ],
      }),
    [chains, expected, rows, trace.rankBins],
  );
  return (
    <PlotFigure
      title="Rank plot"
      caption={`How the ranks of ${trace.label}'s draws, taken over all chains together, spread across ${trace.rankBins} bins, per chain. Well-mixed chains give flat bars near the dashed line (${formatNumber(expected)} draws per bin); a chain piled at one end has stayed high or low.`}
      render={render}
      table={{
        caption: `Rank counts of ${trace.label} per chain and bin`,
        columns: ["Chain", "Bin", "Draws"],
        rows: rows.map((row) => [row.chain, row.bin, row.count]),
      }}
    />
  );
}

/** Trace and rank plots of the parameters that converged worst. */
export function TracePlots({ traces }: { traces: ParameterTrace[] }) {
  if (traces.length === 0) return <p className="text-small text-ink-700">This run stored no draws for trace plots.</p>;
  return (
    <div className="space-y-8">
      {traces.map((trace) => (
        <article key={trace.name} aria-label={`Trace and rank plot of ${trace.label}`} className="space-y-3">
          <h3 className="text-body font-semibold text-ink-900">
            {trace.label} <code className="ml-1 font-mono text-caption font-normal text-ink-600">{trace.name}</code>
          </h3>
          <p className="text-small text-ink-700">
            Shown because: {trace.why}. R-hat {formatNumber(trace.rhat, 4)}, bulk ESS {trace.essBulk === null ? "–" : Math.round(trace.essBulk)}.
          </p>
          <div className="grid gap-6 xl:grid-cols-2">
            <TraceChart trace={trace} />
            <RankChart trace={trace} />
          </div>
        </article>
      ))}
    </div>
  );
}
