// An invented draw set for planning tests: built from numbers, no sampler and no server.
import { DRAW_SET_FORMAT, encodeFloat64, type DrawSetWire } from "@tributary/contracts";
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

/** Workspace ids of the fixture cells, brands and markets (as in test-utils' test portfolio where they overlap). */
export const fixtureCellIds = ["c1", "c3", "c2"];
const brandIds: Record<string, string> = { Fennick: "b-fen", Hollowby: "b-hol" };
const marketIds: Record<string, string> = { Ardeval: "m-ard", Briskmoor: "m-bri" };

/** The draw set as GET /api/runs/current/draw-set sends it (only the given cells, as a market manager would get). */
export function fixtureDrawSetWire(set: DrawSet = fixtureDrawSet(), onlyCells?: string[]): DrawSetWire {
  const keep = set.cells.map((_, g) => onlyCells === undefined || onlyCells.includes(fixtureCellIds[g]!));
  const G = set.cells.length;
  const pick = (values: Float64Array, width: number) => {
    const out: number[] = [];
    for (let d = 0; d < set.drawCount; d++) for (let g = 0; g < G; g++) if (keep[g]) for (let k = 0; k < width; k++) out.push(values[(d * G + g) * width + k]!);
    return encodeFloat64(out);
  };
  const C = set.channels.length;
  const J = set.seasonalityOrder;
  const K = set.controls.length;
  return {
    format: DRAW_SET_FORMAT,
    runId: "run-7",
    publishedAt: "2025-01-06T09:30:00.000Z",
    currency: "EUR",
    model: set.model,
    saturation: set.saturation,
    likelihood: set.likelihood,
    maxLag: set.maxLag,
    seasonalityOrder: J,
    channels: [...set.channels],
    controls: [...set.controls],
    cells: set.cells.flatMap((cell, g) =>
      keep[g]
        ? [
            {
              cellId: fixtureCellIds[g]!,
              brandId: brandIds[cell.brand]!,
              marketId: marketIds[cell.market]!,
              brand: cell.brand,
              market: cell.market,
              firstWeek: cell.firstWeek,
              firstAbsoluteWeek: cell.firstAbsoluteWeek,
              weeks: cell.weeks,
              trainWeeks: cell.trainWeeks,
              outcome: encodeFloat64(cell.outcome),
              spend: cell.spend.map((s) => encodeFloat64(s)),
              seasonalMean: encodeFloat64(cell.seasonalMean),
              controlsStandardised: cell.controlsStandardised.map((s) => encodeFloat64(s)),
            },
          ]
        : [],
    ),
    drawCount: set.drawCount,
    arrays: {
      beta: pick(set.beta, C),
      theta: pick(set.theta, C),
      alpha: pick(set.alpha, C),
      hillShape: pick(set.hillShape, C),
      baselineLevel: pick(set.baselineLevel, 1),
      beta1: pick(set.beta1, 1),
      gamma: pick(set.gamma, J),
      delta: pick(set.delta, J),
      controlCoef: pick(set.controlCoef, K),
      sigma: pick(set.sigma, 1),
      nu: pick(set.nu, 1),
    },
    caution: "Estimates are model-based; confirm large moves with a lift test.",
  };
}
