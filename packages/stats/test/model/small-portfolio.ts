import type { PortfolioData } from "../../src/data/portfolio-data";
import type { LiftTest } from "../../src/model/portfolio/portfolio-options";
import { simulatePortfolio } from "../../src/simulate/simulate-portfolio";
import { testRandomSource } from "./test-random-source";

/** A small invented portfolio for gradient and density tests: 4 cells (unbalanced brand × market), 3 channels. */
export function smallPortfolio(withControls: boolean): PortfolioData {
  const { data } = simulatePortfolio(
    {
      channels: ["Search", "Video", "Radio"],
      cells: [
        { brand: "Alder", market: "Northland", firstWeek: "2023-01-02", weeks: 40, typicalSpend: [4000, 6000, 1500], baseline: 400 },
        { brand: "Alder", market: "Southmere", firstWeek: "2023-02-06", weeks: 30, typicalSpend: [2000, 0, 800], baseline: 150 },
        { brand: "Birchwood", market: "Northland", firstWeek: "2022-11-07", weeks: 36, typicalSpend: [3000, 2500, 0], baseline: 250 },
        { brand: "Birchwood", market: "Eastvale", firstWeek: "2023-03-06", weeks: 20, typicalSpend: [1000, 1200, 600], baseline: 90 },
      ],
    },
    testRandomSource(2024),
  );
  if (!withControls) return data;
  const rng = testRandomSource(99);
  return {
    channels: data.channels,
    controls: ["Price index", "Competitor promo"],
    cells: data.cells.map((cell) => ({
      ...cell,
      controls: [
        Float64Array.from(cell.outcome, () => 100 + 5 * rng.normal()),
        Float64Array.from(cell.outcome, () => (rng.uniform() < 0.2 ? 1 : 0)),
      ],
    })),
  };
}

export const smallLiftTests: readonly LiftTest[] = [
  { brand: "Alder", market: "Northland", channel: "Video", firstWeek: "2023-03-06", lastWeek: "2023-04-03", spend: 20000, incrementalOutcome: 180, standardError: 40 },
  // a window that reaches into the last weeks (the holdout when holdoutWeeks is on)
  { brand: "Birchwood", market: "Northland", channel: "Search", firstWeek: "2023-06-19", lastWeek: "2023-07-10", spend: 9000, incrementalOutcome: 90, standardError: 25 },
];
