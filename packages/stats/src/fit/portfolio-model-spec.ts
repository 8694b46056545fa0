import type { PortfolioData } from "../data/portfolio-data";
import type { ModelSpec } from "../model/density-model";
import { buildPortfolioModel, buildUnpooledCellModel } from "../model/portfolio/build-portfolio-model";
import type { PortfolioModelOptions } from "../model/portfolio/portfolio-options";
import type { ModelBuilder } from "../models/registry";

// No runtime import of models/registry here, so that the registry can import these builders.

/** Model kinds of the portfolio fit, as plain data that can cross to a worker thread. */
export const pooledPortfolioKind = "portfolio-pooled";
export const unpooledPortfolioCellKind = "portfolio-unpooled-cell";

/** The data of a portfolio model spec: the whole portfolio, the model options and, for a no-pooling model, its cell. */
export interface PortfolioSpecData {
  readonly portfolio: PortfolioData;
  readonly options: PortfolioModelOptions;
  readonly cell?: number;
}

export function pooledPortfolioSpec(portfolio: PortfolioData, options: PortfolioModelOptions = {}): ModelSpec {
  const data: PortfolioSpecData = { portfolio, options };
  return { kind: pooledPortfolioKind, data };
}

export function unpooledCellSpec(portfolio: PortfolioData, options: PortfolioModelOptions, cell: number): ModelSpec {
  const data: PortfolioSpecData = { portfolio, options, cell };
  return { kind: unpooledPortfolioCellKind, data };
}

function readSpecData(input: unknown, kind: string): PortfolioSpecData {
  if (input === null || typeof input !== "object") throw new Error(`${kind}: data must be an object`);
  const data = input as Partial<PortfolioSpecData>;
  const portfolio = data.portfolio;
  if (portfolio === null || typeof portfolio !== "object" || !Array.isArray(portfolio.channels) || !Array.isArray(portfolio.cells) || !Array.isArray(portfolio.controls)) {
    throw new Error(`${kind}: data.portfolio must be portfolio data (channels, controls, cells)`);
  }
  const options = data.options ?? {};
  if (options === null || typeof options !== "object") throw new Error(`${kind}: data.options must be an object`);
  return { portfolio, options, cell: data.cell };
}

/** Rebuilds the pooled portfolio model from its spec data (a ModelBuilder). */
export const pooledPortfolioModelFromSpec: ModelBuilder = (input) => {
  const data = readSpecData(input, pooledPortfolioKind);
  return buildPortfolioModel(data.portfolio, data.options);
};

/** Rebuilds the no-pooling model of one cell from its spec data (a ModelBuilder). */
export const unpooledCellModelFromSpec: ModelBuilder = (input) => {
  const data = readSpecData(input, unpooledPortfolioCellKind);
  if (typeof data.cell !== "number") throw new Error(`${unpooledPortfolioCellKind}: data.cell must be a cell index`);
  return buildUnpooledCellModel(data.portfolio, data.cell, data.options);
};

/** The builders to register (models/registry) so that worker threads can rebuild the portfolio models. */
export const portfolioModelBuilders: Readonly<Record<string, ModelBuilder>> = {
  [pooledPortfolioKind]: pooledPortfolioModelFromSpec,
  [unpooledPortfolioCellKind]: unpooledCellModelFromSpec,
};
