import type { DrawSet, DrawSetCell } from "../../src/decisions/draw-set";
import { absoluteWeekOf } from "../../src/model/absolute-week";
import type { SaturationKind } from "../../src/model/saturation";
import type { RandomSource } from "../../src/rng/random-source";

/** One invented cell of a hand-built draw set. */
export interface HandCell {
  readonly brand: string;
  readonly market: string;
  readonly firstWeek: string;
  /** spend[c][t] per week of data. */
  readonly spend: readonly (readonly number[])[];
}

/** Per draw × cell × channel and per draw × cell parameters, written out by hand or drawn in a test. */
export interface HandParameters {
  readonly beta: (d: number, g: number, c: number) => number;
  readonly theta: (d: number, g: number, c: number) => number;
  readonly alpha: (d: number, g: number, c: number) => number;
  readonly hillShape?: (d: number, g: number, c: number) => number;
  readonly baselineLevel: (d: number, g: number) => number;
  readonly beta1: (d: number, g: number) => number;
  readonly gamma: (d: number, g: number, j: number) => number;
  readonly delta: (d: number, g: number, j: number) => number;
  readonly sigma: (d: number, g: number) => number;
}

/**
 * A draw set built directly from numbers (no sampler, no model): the stand-in for a
 * stored run in planning tests. The seasonal means are the training means of the
 * uncentred harmonics, as the model computes them.
 */
export function handDrawSet(options: {
  channels: readonly string[];
  cells: readonly HandCell[];
  draws: number;
  parameters: HandParameters;
  maxLag?: number;
  seasonalityOrder?: number;
  saturation?: SaturationKind;
}): DrawSet {
  const C = options.channels.length;
  const G = options.cells.length;
  const D = options.draws;
  const J = options.seasonalityOrder ?? 2;
  const p = options.parameters;
  const cells: DrawSetCell[] = options.cells.map((cell) => {
    const T = cell.spend[0]!.length;
    const w0 = absoluteWeekOf(cell.firstWeek);
    const seasonalMean = new Float64Array(2 * J);
    for (let j = 1; j <= J; j++) {
      let s = 0;
      let c = 0;
      for (let t = 0; t < T; t++) {
        s += Math.sin((2 * Math.PI * j * (w0 + t)) / 52.1775);
        c += Math.cos((2 * Math.PI * j * (w0 + t)) / 52.1775);
      }
      seasonalMean[2 * (j - 1)] = s / T;
      seasonalMean[2 * (j - 1) + 1] = c / T;
    }
    return {
      brand: cell.brand,
      market: cell.market,
      firstWeek: cell.firstWeek,
      firstAbsoluteWeek: w0,
      weeks: T,
      trainWeeks: T,
      outcome: new Float64Array(T),
      spend: cell.spend.map((s) => Float64Array.from(s)),
      seasonalMean,
      controlsStandardised: [],
    };
  });
  const cc = (f: (d: number, g: number, c: number) => number): Float64Array => {
    const out = new Float64Array(D * G * C);
    for (let d = 0; d < D; d++) for (let g = 0; g < G; g++) for (let c = 0; c < C; c++) out[(d * G + g) * C + c] = f(d, g, c);
    return out;
  };
  const cg = (f: (d: number, g: number) => number): Float64Array => {
    const out = new Float64Array(D * G);
    for (let d = 0; d < D; d++) for (let g = 0; g < G; g++) out[d * G + g] = f(d, g);
    return out;
  };
  const cj = (f: (d: number, g: number, j: number) => number): Float64Array => {
    const out = new Float64Array(D * G * J);
    for (let d = 0; d < D; d++) for (let g = 0; g < G; g++) for (let j = 0; j < J; j++) out[(d * G + g) * J + j] = f(d, g, j);
    return out;
  };
  return {
    version: 1,
    model: "pooled",
    saturation: options.saturation ?? "exponential",
    likelihood: "normal",
    maxLag: options.maxLag ?? 8,
    seasonalityOrder: J,
    channels: [...options.channels],
    controls: [],
    cells,
    drawCount: D,
    beta: cc(p.beta),
    theta: cc(p.theta),
    alpha: cc(p.alpha),
    hillShape: cc(p.hillShape ?? (() => 1)),
    baselineLevel: cg(p.baselineLevel),
    beta1: cg(p.beta1),
    gamma: cj(p.gamma),
    delta: cj(p.delta),
    controlCoef: new Float64Array(0),
    sigma: cg(p.sigma),
    nu: new Float64Array(D * G).fill(Infinity),
  };
}

/**
 * A portfolio-sized invented draw set with lognormal scatter around typical values, for
 * optimiser tests and the benchmark: cells × channels lines, 2 years of weekly spend.
 */
export function scatteredDrawSet(rng: RandomSource, cellCount: number, channels: readonly string[], draws: number, saturation: SaturationKind = "exponential"): DrawSet {
  const brands = ["Alder", "Birchwood", "Cedarline"];
  const markets = ["Northland", "Southmere", "Eastvale", "Westreach", "Lakeshire"];
  const C = channels.length;
  const typical = Array.from({ length: cellCount * C }, () => 500 + 4000 * rng.uniform());
  const logBeta = Array.from({ length: cellCount * C }, () => Math.log(0.004 + 0.02 * rng.uniform()));
  const cells: HandCell[] = Array.from({ length: cellCount }, (_, g) => ({
    brand: brands[g % brands.length]!,
    market: markets[Math.floor(g / brands.length) % markets.length]! + (g >= brands.length * markets.length ? ` ${g}` : ""),
    firstWeek: "2023-01-02",
    spend: Array.from({ length: C }, (_, c) => Array.from({ length: 104 }, () => typical[g * C + c]! * (0.5 + rng.uniform()))),
  }));
  const noise = Array.from({ length: draws * cellCount * C * 3 }, () => rng.normal());
  const at = (d: number, g: number, c: number, k: number): number => noise[((d * cellCount + g) * C + c) * 3 + k]!;
  return handDrawSet({
    channels,
    cells,
    draws,
    saturation,
    parameters: {
      beta: (d, g, c) => Math.exp(logBeta[g * C + c]! + 0.3 * at(d, g, c, 0)),
      theta: (d, g, c) => 1.5 * typical[g * C + c]! * Math.exp(0.3 * at(d, g, c, 1)),
      alpha: (d, g, c) => 0.3 + 0.4 / (1 + Math.exp(-at(d, g, c, 2))),
      hillShape: saturation === "hill" ? (d, g, c) => Math.exp(0.3 * at(d, g, c, 2)) : undefined,
      baselineLevel: () => 300,
      beta1: () => 10,
      gamma: () => 5,
      delta: () => -3,
      sigma: () => 20,
    },
  });
}
