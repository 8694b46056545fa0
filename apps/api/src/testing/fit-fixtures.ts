// A tiny dataset for fit tests: three demo cells, two channels, 40 weeks, simulated from
// the model with a fixed seed, so a fit with 2 chains × (100 + 100) iterations takes seconds.
import Papa from "papaparse";
import { eq } from "drizzle-orm";
import { absoluteWeekOf, createRandomSource, mondayOfAbsoluteWeek, simulatePortfolio, type SimulationDesign } from "@tributary/stats";
import { analyseTidyRows, parseCsvText } from "@tributary/intake";
import type { Database } from "../db/client";
import { users } from "../db/schema";
import { saveDatasetVersion } from "../datasets/save-dataset-version";
import { demoUsers } from "../demo/users";

const weeks = 40;
const firstWeek = mondayOfAbsoluteWeek(absoluteWeekOf("2025-09-29") - (weeks - 1));

export const tinyDesign: SimulationDesign = {
  channels: ["search", "social"],
  cells: [
    { brand: "Kestrova", market: "Veltria", firstWeek, weeks, typicalSpend: [9000, 6000], baseline: 1200 },
    { brand: "Kestrova", market: "Solvera", firstWeek, weeks, typicalSpend: [6000, 5000], baseline: 900 },
    { brand: "Plumrise", market: "Veltria", firstWeek, weeks, typicalSpend: [7000, 4000], baseline: 700 },
  ],
};

export function tinyCsv(): string {
  const { data } = simulatePortfolio(tinyDesign, createRandomSource(77), { noiseShare: 0.05 });
  const rows = data.cells.flatMap((cell) =>
    Array.from(cell.outcome, (y, t) => [mondayOfAbsoluteWeek(absoluteWeekOf(cell.firstWeek) + t), cell.brand, cell.market, Math.round(y), ...cell.spend.map((s) => Math.round(s[t]!))]),
  );
  return Papa.unparse({ fields: ["week", "brand", "market", "new_customers", "spend_search", "spend_social"], data: rows }, { newline: "\n" });
}

/** Saves the tiny dataset as a new version (as the demo analyst); returns its id. */
export async function saveTinyDataset(db: Database): Promise<string> {
  const [analyst] = await db.select({ id: users.id }).from(users).where(eq(users.email, demoUsers.analyst.email));
  const csv = parseCsvText(tinyCsv());
  if (!csv.ok) throw new Error("the tiny dataset does not parse");
  const mapping = {
    week: "week",
    brand: "brand",
    market: "market",
    outcome: "new_customers",
    channels: [
      { column: "spend_search", channel: "search" },
      { column: "spend_social", channel: "social" },
    ],
    controls: [],
    ignored: [],
  };
  const analysis = analyseTidyRows(csv.header, csv.rows, mapping, { rowNumbers: csv.rowNumbers, shortCellWeeks: 8 });
  const saved = await saveDatasetVersion(db, { fileName: "tiny.csv", note: "fit tests", userId: analyst!.id, analysis });
  return saved.id;
}

/** Settings for a fit of a few seconds. */
export const quickFit = { chains: 2, warmup: 100, draws: 100, seed: 2024 } as const;
/** Settings for a fit long enough to be stopped while it runs. */
export const slowFit = { chains: 2, warmup: 5000, draws: 5000, seed: 7 } as const;
