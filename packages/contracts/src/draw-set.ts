import { z } from "zod";

// GET /api/runs/current/draw-set: the current run's planning draws for the cells the
// viewer may see, for the Spend planner and Budget split workers. Every numeric array
// is sent as base64 of little-endian Float64 values (exact, and Infinity survives,
// which JSON numbers cannot carry). `decodeDrawSet` turns the wire form back into the
// draw set the stats package's planning functions take.

export const DRAW_SET_FORMAT = "tributary-draws/1" as const;

const base64 = z.string();

export const drawSetCellWireSchema = z.object({
  /** Workspace ids of the cell, its brand and its market. */
  cellId: z.string(),
  brandId: z.string(),
  marketId: z.string(),
  brand: z.string(),
  market: z.string(),
  /** ISO Monday of the first data week. */
  firstWeek: z.string(),
  firstAbsoluteWeek: z.number().int(),
  /** All weeks with data (training + holdout). */
  weeks: z.number().int(),
  trainWeeks: z.number().int(),
  /** Float64 × weeks. */
  outcome: base64,
  /** One Float64 × weeks series per channel, in the order of `channels`. */
  spend: z.array(base64),
  /** Float64 × 2·seasonalityOrder. */
  seasonalMean: base64,
  /** One Float64 × weeks series per control. */
  controlsStandardised: z.array(base64),
});
export type DrawSetCellWire = z.infer<typeof drawSetCellWireSchema>;

/**
 * Arrays are row-major by draw over the cells *of this response* (G = cells.length):
 * per cell × channel at (d·G + g)·C + c, per cell at d·G + g, per cell × harmonic at
 * (d·G + g)·J + j, per cell × control at (d·G + g)·K + k.
 */
export const drawSetArraysWireSchema = z.object({
  beta: base64,
  theta: base64,
  alpha: base64,
  hillShape: base64,
  baselineLevel: base64,
  beta1: base64,
  gamma: base64,
  delta: base64,
  controlCoef: base64,
  sigma: base64,
  nu: base64,
});

export const drawSetWireSchema = z.object({
  format: z.literal(DRAW_SET_FORMAT),
  runId: z.string(),
  /** When the run was published (ISO). */
  publishedAt: z.string(),
  currency: z.string(),
  model: z.enum(["pooled", "unpooled"]),
  saturation: z.enum(["exponential", "hill"]),
  likelihood: z.enum(["normal", "student-t"]),
  maxLag: z.number().int(),
  seasonalityOrder: z.number().int(),
  channels: z.array(z.string()),
  controls: z.array(z.string()),
  /** Only the cells asked for and in the viewer's markets, in the run's cell order. */
  cells: z.array(drawSetCellWireSchema),
  drawCount: z.number().int(),
  arrays: drawSetArraysWireSchema,
  /** Shown wherever planning results are shown. */
  caution: z.string(),
});
export type DrawSetWire = z.infer<typeof drawSetWireSchema>;

/** A decoded draw set: the shape of the stats package's `DrawSet`, plus the workspace ids. */
export interface DecodedDrawSetCell {
  readonly cellId: string;
  readonly brandId: string;
  readonly marketId: string;
  readonly brand: string;
  readonly market: string;
  readonly firstWeek: string;
  readonly firstAbsoluteWeek: number;
  readonly weeks: number;
  readonly trainWeeks: number;
  readonly outcome: Float64Array;
  readonly spend: readonly Float64Array[];
  readonly seasonalMean: Float64Array;
  readonly controlsStandardised: readonly Float64Array[];
}

export interface DecodedDrawSet {
  readonly version: 1;
  readonly runId: string;
  readonly publishedAt: string;
  readonly currency: string;
  readonly model: "pooled" | "unpooled";
  readonly saturation: "exponential" | "hill";
  readonly likelihood: "normal" | "student-t";
  readonly maxLag: number;
  readonly seasonalityOrder: number;
  readonly channels: readonly string[];
  readonly controls: readonly string[];
  readonly cells: readonly DecodedDrawSetCell[];
  readonly drawCount: number;
  readonly beta: Float64Array;
  readonly theta: Float64Array;
  readonly alpha: Float64Array;
  readonly hillShape: Float64Array;
  readonly baselineLevel: Float64Array;
  readonly beta1: Float64Array;
  readonly gamma: Float64Array;
  readonly delta: Float64Array;
  readonly controlCoef: Float64Array;
  readonly sigma: Float64Array;
  readonly nu: Float64Array;
  readonly caution: string;
}

const CHUNK = 0x8000;

/** Base64 of the values as little-endian Float64 (works in browsers, workers and Node). */
export function encodeFloat64(values: ArrayLike<number>): string {
  const bytes = new Uint8Array(values.length * 8);
  const view = new DataView(bytes.buffer);
  for (let i = 0; i < values.length; i++) view.setFloat64(i * 8, values[i]!, true);
  let binary = "";
  for (let i = 0; i < bytes.length; i += CHUNK) binary += String.fromCharCode(...bytes.subarray(i, i + CHUNK));
  return btoa(binary);
}

/** The values of `encodeFloat64`; throws when the text is not whole Float64 values. */
export function decodeFloat64(text: string): Float64Array {
  const binary = atob(text);
  if (binary.length % 8 !== 0) throw new RangeError(`draw set: ${binary.length} bytes are not whole Float64 values`);
  const bytes = new Uint8Array(binary.length);
  for (let i = 0; i < binary.length; i++) bytes[i] = binary.charCodeAt(i);
  const view = new DataView(bytes.buffer);
  const out = new Float64Array(binary.length / 8);
  for (let i = 0; i < out.length; i++) out[i] = view.getFloat64(i * 8, true);
  return out;
}

/** The wire form back as a draw set, with every array's length checked. */
export function decodeDrawSet(wire: DrawSetWire): DecodedDrawSet {
  const G = wire.cells.length;
  const C = wire.channels.length;
  const J = wire.seasonalityOrder;
  const K = wire.controls.length;
  const D = wire.drawCount;
  const sized = (name: string, text: string, length: number): Float64Array => {
    const values = decodeFloat64(text);
    if (values.length !== length) throw new RangeError(`draw set: ${name} has ${values.length} values, ${length} expected`);
    return values;
  };
  const cells = wire.cells.map((cell): DecodedDrawSetCell => {
    const label = `${cell.brand} × ${cell.market}`;
    if (cell.spend.length !== C) throw new RangeError(`draw set: ${label} has ${cell.spend.length} spend series, ${C} expected`);
    if (cell.controlsStandardised.length !== K) throw new RangeError(`draw set: ${label} has ${cell.controlsStandardised.length} control series, ${K} expected`);
    return {
      cellId: cell.cellId,
      brandId: cell.brandId,
      marketId: cell.marketId,
      brand: cell.brand,
      market: cell.market,
      firstWeek: cell.firstWeek,
      firstAbsoluteWeek: cell.firstAbsoluteWeek,
      weeks: cell.weeks,
      trainWeeks: cell.trainWeeks,
      outcome: sized(`${label} outcome`, cell.outcome, cell.weeks),
      spend: cell.spend.map((s, c) => sized(`${label} spend of ${wire.channels[c]}`, s, cell.weeks)),
      seasonalMean: sized(`${label} seasonal means`, cell.seasonalMean, 2 * J),
      controlsStandardised: cell.controlsStandardised.map((s, k) => sized(`${label} control ${wire.controls[k]}`, s, cell.weeks)),
    };
  });
  const a = wire.arrays;
  return {
    version: 1,
    runId: wire.runId,
    publishedAt: wire.publishedAt,
    currency: wire.currency,
    model: wire.model,
    saturation: wire.saturation,
    likelihood: wire.likelihood,
    maxLag: wire.maxLag,
    seasonalityOrder: J,
    channels: [...wire.channels],
    controls: [...wire.controls],
    cells,
    drawCount: D,
    beta: sized("beta", a.beta, D * G * C),
    theta: sized("theta", a.theta, D * G * C),
    alpha: sized("alpha", a.alpha, D * G * C),
    hillShape: sized("hillShape", a.hillShape, D * G * C),
    baselineLevel: sized("baselineLevel", a.baselineLevel, D * G),
    beta1: sized("beta1", a.beta1, D * G),
    gamma: sized("gamma", a.gamma, D * G * J),
    delta: sized("delta", a.delta, D * G * J),
    controlCoef: sized("controlCoef", a.controlCoef, D * G * K),
    sigma: sized("sigma", a.sigma, D * G),
    nu: sized("nu", a.nu, D * G),
    caution: wire.caution,
  };
}
