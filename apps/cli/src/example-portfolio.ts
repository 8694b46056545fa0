import Papa from "papaparse";
import { createRandomSource, simulatePortfolio, type PortfolioData, type SimulationDesign } from "@tributary/stats";

/**
 * A small invented portfolio for trying `pnpm fit`: three brands in three markets
 * (unbalanced: six of the nine pairs), three channels, two years of weeks, two cells
 * starting later. Every name is made up.
 */
export const examplePortfolioDesign: SimulationDesign = {
  channels: ["search", "social", "video"],
  cells: [
    { brand: "Fenwick Tea", market: "Valdoria", firstWeek: "2023-01-02", weeks: 104, typicalSpend: [9000, 6000, 12000], baseline: 620 },
    { brand: "Fenwick Tea", market: "Eastmarch", firstWeek: "2023-01-02", weeks: 104, typicalSpend: [5000, 4000, 0], baseline: 310 },
    { brand: "Orla Oats", market: "Valdoria", firstWeek: "2023-01-02", weeks: 104, typicalSpend: [7000, 8000, 9000], baseline: 480 },
    { brand: "Orla Oats", market: "Lowen Isles", firstWeek: "2023-07-03", weeks: 78, typicalSpend: [3000, 2500, 4000], baseline: 190 },
    { brand: "Brisk Mill", market: "Eastmarch", firstWeek: "2023-01-02", weeks: 104, typicalSpend: [6000, 3000, 7000], baseline: 360 },
    { brand: "Brisk Mill", market: "Lowen Isles", firstWeek: "2024-01-01", weeks: 52, typicalSpend: [2500, 2000, 0], baseline: 150 },
  ],
};

export const EXAMPLE_COLUMNS = ["week", "brand", "market", "new_customers"] as const;

function addDays(isoDate: string, days: number): string {
  const date = new Date(`${isoDate}T00:00:00Z`);
  date.setUTCDate(date.getUTCDate() + days);
  return date.toISOString().slice(0, 10);
}

/** The tidy CSV of a portfolio: one row per cell and week; outcome in whole customers, spend in cents. */
export function tidyCsvOf(data: PortfolioData): string {
  const header = [...EXAMPLE_COLUMNS, ...data.channels.map((c) => `spend_${c}`)];
  const rows: (string | number)[][] = [];
  for (const cell of data.cells) {
    for (let t = 0; t < cell.outcome.length; t++) {
      rows.push([
        addDays(cell.firstWeek, 7 * t),
        cell.brand,
        cell.market,
        Math.max(0, Math.round(cell.outcome[t]!)),
        ...cell.spend.map((series) => Math.round(series[t]! * 100) / 100),
      ]);
    }
  }
  return `${Papa.unparse({ fields: header, data: rows }, { newline: "\n" })}\n`;
}

/** Generates the example portfolio from the model with a seeded generator (same seed, same file). */
export function exampleCsv(seed: number, design: SimulationDesign = examplePortfolioDesign): string {
  const { data } = simulatePortfolio(design, createRandomSource(seed));
  return tidyCsvOf(data);
}
