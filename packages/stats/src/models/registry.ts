import type { DensityModel, ModelSpec } from "../model/density-model";
import { eightSchoolsKind, eightSchoolsModel } from "./examples/eight-schools";
import { funnelKind, funnelModel } from "./examples/funnel";
import { normalMeanKind, normalMeanModel } from "./examples/normal-mean";
import { scaledGaussianKind, scaledGaussianModel } from "./examples/scaled-gaussian";
import { portfolioPooledKind, portfolioPooledModel, portfolioUnpooledKind, portfolioUnpooledModel } from "../model/portfolio/portfolio-model-kinds";

/** Builds a model from its plain-data description; throws a clear error on bad data. */
export type ModelBuilder = (data: unknown) => DensityModel;

/**
 * Every model kind a worker can rebuild from a ModelSpec. Add a kind here (a worker
 * only knows the kinds this module registers at load time).
 */
export const modelBuilders: Readonly<Record<string, ModelBuilder>> = {
  [eightSchoolsKind]: eightSchoolsModel,
  [normalMeanKind]: normalMeanModel,
  [scaledGaussianKind]: scaledGaussianModel,
  [funnelKind]: funnelModel,
  [portfolioPooledKind]: portfolioPooledModel,
  [portfolioUnpooledKind]: portfolioUnpooledModel,
};

export function buildModel(spec: ModelSpec): DensityModel {
  if (spec === null || typeof spec !== "object" || typeof spec.kind !== "string") {
    throw new Error("model spec must be an object with a string `kind`");
  }
  if (!Object.prototype.hasOwnProperty.call(modelBuilders, spec.kind)) {
    throw new Error(`unknown model kind "${spec.kind}"; known kinds: ${Object.keys(modelBuilders).join(", ")}`);
  }
  return modelBuilders[spec.kind]!(spec.data);
}
