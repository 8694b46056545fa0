// The downloadable example of the tidy CSV format: a small invented portfolio simulated
// from the model with a fixed seed (not the workspace's data, so it shows no market's
// real numbers to anyone). It passes the intake's validation.
import Papa from "papaparse";
import { absoluteWeekOf, createRandomSource, mondayOfAbsoluteWeek, simulatePortfolio, type SimulationDesign } from "@tributary/stats";

export const exampleCsvFileName = "tributary-example-weekly.csv";
const exampleSeed = 4_021_977;
const lastWeek = "2025-06-30";

const firstWeekFor = (weeks: number) => mondayOfAbsoluteWeek(absoluteWeekOf(lastWeek) - (weeks - 1));

/** Two invented brands in two invented markets; one cell launched later than the others. */
export const exampleDesign: SimulationDesign = {
  channels: ["search", "social", "tv"],
  cells: [
    { brand: "Larkspine", market: "Vessoria", firstWeek: firstWeekFor(104), weeks: 104, typicalSpend: [9000, 6000, 15000], baseline: 1200 },
    { brand: "Larkspine", market: "Ambrel", firstWeek: firstWeekFor(104), weeks: 104, typicalSpend: [6000, 4000, 0], baseline: 800 },
    { brand: "Tovenhall", market: "Vessoria", firstWeek: firstWeekFor(40), weeks: 40, typicalSpend: [5000, 5000, 8000], baseline: 600 },
  ],
};

let cached: string | null = null;

/** The example file's text: week, brand, market, new_customers, spend_<channel> per channel. */
export function exampleCsv(): string {
  if (cached !== null) return cached;
  const { data } = simulatePortfolio(exampleDesign, createRandomSource(exampleSeed), { noiseShare: 0.05 });
  const header = ["week", "brand", "market", "new_customers", ...data.channels.map((c) => `spend_${c}`)];
  const rows: (string | number)[][] = [];
  for (const cell of data.cells) {
    const first = absoluteWeekOf(cell.firstWeek);
    for (let t = 0; t < cell.outcome.length; t++) {
      rows.push([
        mondayOfAbsoluteWeek(first + t),
        cell.brand,
        cell.market,
        Math.max(0, Math.round(cell.outcome[t]!)),
        ...cell.spend.map((series) => Math.round(series[t]! * 100) / 100),
      ]);
    }
  }
  cached = Papa.unparse({ fields: header, data: rows }, { newline: "\n" }) + "\n";
  return cached;
}
