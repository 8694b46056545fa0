import type { PortfolioData } from "../../data/portfolio-data";
import type { DensityModel } from "../density-model";
import { buildPortfolioModel, buildUnpooledCellModel } from "./build-portfolio-model";
import type { PortfolioModelOptions } from "./portfolio-options";

/** Registry kind of the pooled portfolio model; data: PortfolioModelSpecData. */
export const portfolioPooledKind = "portfolio-pooled";
/** Registry kind of one cell's no-pooling model; data: UnpooledCellSpecData. */
export const portfolioUnpooledKind = "portfolio-unpooled";

/** Plain, structured-clonable data of a pooled model (crosses worker boundaries). */
export interface PortfolioModelSpecData {
  readonly portfolio: PortfolioData;
  readonly options?: PortfolioModelOptions;
}

/** Plain data of one cell's no-pooling model: the whole portfolio and the cell's index. */
export interface UnpooledCellSpecData extends PortfolioModelSpecData {
  readonly cell: number;
}

function readPortfolio(data: unknown, kind: string): PortfolioModelSpecData {
  if (data === null || typeof data !== "object") throw new RangeError(`${kind}: model data must be an object { portfolio, options }`);
  const spec = data as Partial<PortfolioModelSpecData>;
  const portfolio = spec.portfolio;
  if (portfolio === null || typeof portfolio !== "object" || !Array.isArray(portfolio.channels) || !Array.isArray(portfolio.cells) || !Array.isArray(portfolio.controls)) {
    throw new RangeError(`${kind}: model data needs a portfolio with channels, controls and cells`);
  }
  portfolio.cells.forEach((cell, g) => {
    if (cell === null || typeof cell !== "object" || !(cell.outcome instanceof Float64Array) || !Array.isArray(cell.spend) || !Array.isArray(cell.controls)) {
      throw new RangeError(`${kind}: cell ${g} needs outcome (Float64Array), spend and controls`);
    }
    for (const s of [...cell.spend, ...cell.controls]) if (!(s instanceof Float64Array)) throw new RangeError(`${kind}: cell ${g} series must be Float64Arrays`);
  });
  if (spec.options !== undefined && (spec.options === null || typeof spec.options !== "object")) throw new RangeError(`${kind}: options must be an object`);
  return { portfolio, options: spec.options ?? {} };
}

export function portfolioPooledModel(data: unknown): DensityModel {
  const spec = readPortfolio(data, portfolioPooledKind);
  return buildPortfolioModel(spec.portfolio, spec.options);
}

export function portfolioUnpooledModel(data: unknown): DensityModel {
  const spec = readPortfolio(data, portfolioUnpooledKind);
  const cell = (data as Partial<UnpooledCellSpecData>).cell;
  if (typeof cell !== "number") throw new RangeError(`${portfolioUnpooledKind}: model data needs the cell's index`);
  return buildUnpooledCellModel(spec.portfolio, cell, spec.options);
}
