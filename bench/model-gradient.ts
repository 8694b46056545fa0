// Times one log-density-and-gradient evaluation of the pooled portfolio model on the
// benchmark portfolio (10 cells × 4 channels × up to 156 weeks). Prints JSON.
import { buildPortfolioModel } from "../packages/stats/src/model/portfolio/build-portfolio-model";
import { createRandomSource } from "../packages/stats/src/rng/create-random-source";
import { benchmarkPortfolio } from "./model-portfolio";

function timePerGradient(options: Parameters<typeof buildPortfolioModel>[1]): { msPerGradient: number; dimension: number } {
  const { data } = benchmarkPortfolio();
  const model = buildPortfolioModel(data, options);
  const rng = createRandomSource(7);
  const points = Array.from({ length: 16 }, () => {
    const q = new Float64Array(model.dimension);
    model.initialPoint(rng, q);
    return q;
  });
  const grad = new Float64Array(model.dimension);
  let sink = 0;
  for (let i = 0; i < 20_000; i++) sink += model.logDensityGradient(points[i % 16]!, grad);
  const runs: number[] = [];
  for (let rep = 0; rep < 5; rep++) {
    const n = 20_000;
    const start = process.hrtime.bigint();
    for (let i = 0; i < n; i++) sink += model.logDensityGradient(points[i % 16]!, grad);
    runs.push(Number(process.hrtime.bigint() - start) / 1e6 / n);
  }
  if (!Number.isFinite(sink)) throw new Error("non-finite log density in the benchmark");
  runs.sort((a, b) => a - b);
  return { msPerGradient: runs[2]!, dimension: model.dimension };
}

const result = {
  benchmark: "model-gradient",
  portfolio: "10 cells × 4 channels × 156 weeks (two cells of 26 weeks)",
  node: process.version,
  normal: timePerGradient({}),
  studentT: timePerGradient({ likelihood: "student-t" }),
  hill: timePerGradient({ saturation: "hill" }),
  target: { msPerGradient: 0.1 },
};
console.log(JSON.stringify(result, null, 2));
