import type { DensityModel, ModelSpec } from "../model/density-model";
import { buildModel, modelBuilders } from "../models/registry";
import { portfolioModelBuilders } from "./portfolio-model-spec";

/** True when the shared model registry (what worker threads use) knows the portfolio kinds. */
export function registryKnowsPortfolioModels(): boolean {
  return Object.keys(portfolioModelBuilders).every((kind) => Object.prototype.hasOwnProperty.call(modelBuilders, kind));
}

/** Builds a model in this thread: the portfolio kinds here, any other kind through the registry. */
export function buildFitModel(spec: ModelSpec): DensityModel {
  if (spec !== null && typeof spec === "object" && Object.prototype.hasOwnProperty.call(portfolioModelBuilders, spec.kind)) {
    return portfolioModelBuilders[spec.kind]!(spec.data);
  }
  return buildModel(spec);
}
