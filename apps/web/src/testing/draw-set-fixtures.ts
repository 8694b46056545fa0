// An invented draw set for planning tests: built from numbers, no sampler and no server.
import { absoluteWeekOf, createRandomSource, type DrawSet, type DrawSetCell } from "@tributary/stats";

type FixtureCell = { brand: string; market: string; firstWeek: string; weeks: number; typicalSpend: [number, number] };

/** Three cells of the invented test portfolio (see test-utils), channels search and radio. */
export const fixtureCells: FixtureCell[] = [
  { brand: "Fennick", market: "Ardeval", firstWeek: "2024-01-01", weeks: 40, typicalSpend: [2000, 1200] },
  { brand: "Hollowby", market: "Ardeval", firstWeek: "2024-01-01", weeks: 40, typicalSpend: [900, 600] },
  { brand: "Fennick", market: "Briskmoor", firstWeek: "2024-05-06", weeks: 22, typicalSpend: [700, 0] },
];

/**
 * A draw set whose parameters scatter around typical values with a seeded generator;
 * exponential saturation, Normal noise, seasonality order 1, no controls.
 */
export function fixtureDrawSet(draws = 60, seed = 7): DrawSet {
  const rng = createRandomSource(seed);
  const channels = ["search", "radio"];
  const C = channels.length;
  const G = fixtureCells.length;
  const D = draws;
  const J = 1;
  const cells: DrawSetCell[] = fixtureCells.map((cell, g) => {
    const T = cell.weeks;
    const w0 = absoluteWeekOf(cell.firstWeek);
    let s = 0;
    let c = 0;
    for (let t = 0; t < T; t++) {
      s += Math.sin((2 * Math.PI * (w0 + t)) / 52.1775);
      c += Math.cos((2 * Math.PI * (w0 + t)) / 52.1775);
    }
    return {
      brand: cell.brand,
      market: cell.market,
      firstWeek: cell.firstWeek,
      firstAbsoluteWeek: w0,
      weeks: T,
      trainWeeks: T,
      outcome: Float64Array.from({ length: T }, (_, t) => 300 + 40 * g + 5 * (t % 3)),
      spend: cell.typicalSpend.map((typical, k) => Float64Array.from({ length: T }, (_, t) => (typical === 0 ? 0 : typical * (0.8 + 0.1 * ((t + k + g) % 5))))),
      seasonalMean: Float64Array.from([s / T, c / T]),
      controlsStandardised: [],
    };
  });
  const beta = new Float64Array(D * G * C);
  const theta = new Float64Array(D * G * C);
  const alpha = new Float64Array(D * G * C);
  for (let d = 0; d < D; d++) {
    for (let g = 0; g < G; g++) {
      for (let k = 0; k < C; k++) {
        const at = (d * G + g) * C + k;
        const typical = fixtureCells[g]!.typicalSpend[k] || 500;
        beta[at] = (k === 0 ? 0.02 : 0.01) * Math.exp(0.25 * rng.normal());
        theta[at] = 2 * typical * Math.exp(0.2 * rng.normal());
        alpha[at] = 0.3 + 0.3 * rng.uniform();
      }
    }
  }
  const perCell = (f: (g: number) => number) => Float64Array.from({ length: D * G }, (_, i) => f(i % G) * (1 + 0.02 * rng.normal()));
  return {
    version: 1,
    model: "pooled",
    saturation: "exponential",
    likelihood: "normal",
    maxLag: 6,
    seasonalityOrder: J,
    channels,
    controls: [],
    cells,
    drawCount: D,
    beta,
    theta,
    alpha,
    hillShape: new Float64Array(D * G * C).fill(1),
    baselineLevel: perCell((g) => 250 + 40 * g),
    beta1: perCell(() => 6),
    gamma: perCell(() => 12),
    delta: perCell(() => -5),
    controlCoef: new Float64Array(0),
    sigma: perCell((g) => 15 + 3 * g),
    nu: new Float64Array(D * G).fill(Infinity),
  };
}
