import type { PortfolioData } from "../../data/portfolio-data";
import type { DensityModel } from "../density-model";
import type { RandomSource } from "../../rng/random-source";
import { buildParameterLayout } from "./parameter-layout";
import { buildPortfolioConstants } from "./portfolio-constants";
import { PortfolioDensity } from "./portfolio-density";
import { resolvePortfolioOptions, type PortfolioModelOptions } from "./portfolio-options";

/** The pooled portfolio model (model.md) on the given data; throws a RangeError on bad data or options. */
export function buildPortfolioModel(data: PortfolioData, options: PortfolioModelOptions = {}): PortfolioDensity {
  const resolved = resolvePortfolioOptions(data.channels, options);
  const constants = buildPortfolioConstants(data, resolved);
  return new PortfolioDensity(constants, resolved, buildParameterLayout(constants, resolved, "pooled"));
}

/** The data of one cell as a one-cell portfolio (lift tests of other cells dropped). */
function singleCellData(data: PortfolioData, g: number, options: PortfolioModelOptions): { data: PortfolioData; options: PortfolioModelOptions } {
  const cell = data.cells[g]!;
  const liftTests = (options.liftTests ?? []).filter((t) => t.brand === cell.brand && t.market === cell.market);
  const fixed = options.baselinePriorScale;
  const baselinePriorScale = fixed === undefined ? undefined : { centre: fixed.centre.slice(g, g + 1), scale: fixed.scale.slice(g, g + 1) };
  return { data: { channels: data.channels, controls: data.controls, cells: [cell] }, options: { ...options, liftTests, baselinePriorScale, cellEffectGuide: "none" } };
}

/**
 * The no-pooling comparison: one independent model per cell, log β[g,c] = η[g,c] with
 * η ~ the prior of μ_c, and α, λ per cell and channel. The cells share nothing, so each
 * can be fitted on its own (in parallel). The whole data set is validated first.
 */
export function buildUnpooledCellModels(data: PortfolioData, options: PortfolioModelOptions = {}): PortfolioDensity[] {
  buildPortfolioConstants(data, resolvePortfolioOptions(data.channels, options));
  return data.cells.map((_, g) => buildUnpooledCellModel(data, g, options));
}

/** The no-pooling model of cell g alone (its parameter names carry the cell's index g). */
export function buildUnpooledCellModel(data: PortfolioData, g: number, options: PortfolioModelOptions = {}): PortfolioDensity {
  if (!Number.isInteger(g) || g < 0 || g >= data.cells.length) throw new RangeError(`cell index ${g} is outside 0..${data.cells.length - 1}`);
  const single = singleCellData(data, g, options);
  const resolved = resolvePortfolioOptions(single.data.channels, single.options);
  const constants = buildPortfolioConstants(single.data, resolved);
  return new PortfolioDensity(constants, resolved, buildParameterLayout(constants, resolved, "unpooled"), g);
}

/**
 * Independent models as one: the joint density is the sum, the vector is the
 * concatenation, the names are the union (the models' names must not collide).
 */
export function combineIndependentModels(models: readonly DensityModel[]): DensityModel {
  if (models.length === 0) throw new RangeError("combineIndependentModels: no models given");
  const offsets: number[] = [];
  const nameOffsets: number[] = [];
  let dimension = 0;
  let nameCount = 0;
  const names: string[] = [];
  for (const m of models) {
    offsets.push(dimension);
    nameOffsets.push(nameCount);
    dimension += m.dimension;
    nameCount += m.constrainedNames.length;
    names.push(...m.constrainedNames);
  }
  if (new Set(names).size !== names.length) throw new RangeError("combineIndependentModels: parameter names collide");
  const views = models.map((m, i) => ({ model: m, start: offsets[i]!, nameStart: nameOffsets[i]! }));
  return {
    dimension,
    constrainedNames: names,
    logDensityGradient(q, grad) {
      let lp = 0;
      for (const v of views) {
        lp += v.model.logDensityGradient(q.subarray(v.start, v.start + v.model.dimension), grad.subarray(v.start, v.start + v.model.dimension));
      }
      return lp;
    },
    constrain(q, out) {
      for (const v of views) {
        v.model.constrain(q.subarray(v.start, v.start + v.model.dimension), out.subarray(v.nameStart, v.nameStart + v.model.constrainedNames.length));
      }
    },
    initialPoint(rng: RandomSource, out: Float64Array) {
      for (const v of views) {
        const part = out.subarray(v.start, v.start + v.model.dimension);
        if (v.model.initialPoint) v.model.initialPoint(rng, part);
        else for (let i = 0; i < part.length; i++) part[i] = 4 * rng.uniform() - 2;
      }
    },
  };
}

/**
 * Draws of independently fitted models side by side: row-major draw matrices with equal
 * draw counts, joined column-wise under the union of names.
 */
export function combineIndependentDraws(
  parts: readonly { readonly names: readonly string[]; readonly draws: Float64Array }[],
): { names: string[]; draws: Float64Array; drawCount: number } {
  if (parts.length === 0) throw new RangeError("combineIndependentDraws: nothing to combine");
  const first = parts[0]!;
  const drawCount = first.names.length === 0 ? 0 : first.draws.length / first.names.length;
  for (const p of parts) {
    if (p.names.length === 0 || p.draws.length !== drawCount * p.names.length) {
      throw new RangeError("combineIndependentDraws: every part must have the same number of draws");
    }
  }
  const names = parts.flatMap((p) => [...p.names]);
  if (new Set(names).size !== names.length) throw new RangeError("combineIndependentDraws: parameter names collide");
  const width = names.length;
  const draws = new Float64Array(drawCount * width);
  let column = 0;
  for (const p of parts) {
    const w = p.names.length;
    for (let d = 0; d < drawCount; d++) draws.set(p.draws.subarray(d * w, (d + 1) * w), d * width + column);
    column += w;
  }
  return { names, draws, drawCount };
}
