// Generates the demo portfolio's weekly data and its true parameters from the seed.
// Deterministic: the same seed gives the same data and truth on every run.
import { createRandomSource, simulatePortfolio, type SimulatedPortfolio, type SimulationOverrides } from "@tributary/stats";
import { demoChannelTruths, demoDesign, demoRealDifference, demoSeed } from "./demo-design";

export function simulateDemo(seed = demoSeed): SimulatedPortfolio {
  const base: SimulationOverrides = { channels: demoChannelTruths, noiseShare: 0.05 };
  const drawn = simulatePortfolio(demoDesign, createRandomSource(seed), base);

  // Second pass with the same seed: every draw repeats, except that the chosen cell's
  // channel effect is set to a multiple of its pooled draw.
  const g = demoDesign.cells.findIndex(
    (cell) => cell.brand === demoRealDifference.brand && cell.market === demoRealDifference.market,
  );
  const c = demoDesign.channels.indexOf(demoRealDifference.channel);
  const cellTruth = drawn.truth.cells[g];
  if (!cellTruth || c < 0) throw new Error("demo design: the real-difference cell or channel is missing");
  const beta = cellTruth.beta.map((value, k) => (k === c ? value * demoRealDifference.betaFactor : value));
  const cellOverrides = demoDesign.cells.map((_, k) => (k === g ? { beta } : undefined));
  return simulatePortfolio(demoDesign, createRandomSource(seed), { ...base, cells: cellOverrides });
}
