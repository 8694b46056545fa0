// The benchmark portfolio (invented): 10 cells (4 brands × 3 markets, unbalanced),
// 4 channels, 156 weeks except two cells of only 26 weeks; generated from the model.
import { createRandomSource } from "../packages/stats/src/rng/create-random-source";
import { simulatePortfolio, type SimulatedPortfolio } from "../packages/stats/src/simulate/simulate-portfolio";
import type { SimulationDesign } from "../packages/stats/src/simulate/simulation-design";

export const benchmarkDesign: SimulationDesign = {
  channels: ["Search", "Social", "Video", "Audio"],
  cells: [
    { brand: "Lumen", market: "Norvik", firstWeek: "2022-01-03", weeks: 156, typicalSpend: [12000, 8000, 15000, 4000], baseline: 900 },
    { brand: "Lumen", market: "Calderra", firstWeek: "2022-01-03", weeks: 156, typicalSpend: [6000, 5000, 0, 2500], baseline: 420 },
    { brand: "Lumen", market: "Ostreva", firstWeek: "2022-02-07", weeks: 156, typicalSpend: [4000, 3000, 6000, 0], baseline: 300 },
    { brand: "Fernhollow", market: "Norvik", firstWeek: "2022-01-03", weeks: 156, typicalSpend: [9000, 10000, 12000, 3000], baseline: 650 },
    { brand: "Fernhollow", market: "Calderra", firstWeek: "2022-03-07", weeks: 156, typicalSpend: [5000, 4000, 5000, 2000], baseline: 380 },
    { brand: "Quillby", market: "Norvik", firstWeek: "2022-01-03", weeks: 156, typicalSpend: [7000, 6000, 0, 2500], baseline: 500 },
    { brand: "Quillby", market: "Ostreva", firstWeek: "2022-01-03", weeks: 156, typicalSpend: [3000, 3500, 4000, 1500], baseline: 260 },
    { brand: "Tessaly", market: "Calderra", firstWeek: "2022-01-03", weeks: 156, typicalSpend: [8000, 7000, 9000, 2000], baseline: 560 },
    { brand: "Tessaly", market: "Norvik", firstWeek: "2024-07-01", weeks: 26, typicalSpend: [6000, 5000, 7000, 2000], baseline: 450 },
    { brand: "Quillby", market: "Calderra", firstWeek: "2024-07-01", weeks: 26, typicalSpend: [3000, 2500, 0, 1000], baseline: 220 },
  ],
};

export const BENCHMARK_DATA_SEED = 20240601;

/** The benchmark data with the truth it was drawn from; cac0 truths spread over 20–400. */
export function benchmarkPortfolio(): SimulatedPortfolio {
  return simulatePortfolio(benchmarkDesign, createRandomSource(BENCHMARK_DATA_SEED));
}
