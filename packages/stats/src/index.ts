export type { DensityModel, ModelSpec } from "./model/density-model";
export type { RandomSource } from "./rng/random-source";
export type { CellSeries, PortfolioData } from "./data/portfolio-data";
