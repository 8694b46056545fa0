// An invented dataset version with two cells, for the Model setup tests.
import type { DatasetSeries, DatasetVersion, DatasetVersionDetail } from "@tributary/contracts";

const weeks = Array.from({ length: 20 }, (_, t) => new Date(Date.UTC(2024, 0, 1 + 7 * t)).toISOString().slice(0, 10));

export const testDatasetVersion: DatasetVersion = {
  id: "dv-1",
  number: 3,
  fileName: "tallowmere-weekly.csv",
  note: null,
  outcomeColumn: "new_customers",
  channels: ["search", "radio"],
  controls: [],
  createdAt: "2025-02-03T09:30:00.000Z",
  createdBy: { id: "u-n", name: "Nell Ostrand" },
  rows: 40,
  cellCount: 2,
  firstWeek: weeks[0]!,
  lastWeek: weeks[weeks.length - 1]!,
  errorCount: 0,
  warningCount: 0,
  latest: true,
};

const cells = [
  { cellId: "c1", brandId: "b-fen", marketId: "m-ard", brand: "Fennick", market: "Ardeval", firstWeek: weeks[0]!, lastWeek: weeks[19]!, weeks: 20 },
  { cellId: "c2", brandId: "b-hol", marketId: "m-ard", brand: "Hollowby", market: "Ardeval", firstWeek: weeks[0]!, lastWeek: weeks[19]!, weeks: 20 },
];

export const testDatasetDetail: DatasetVersionDetail = {
  ...testDatasetVersion,
  mapping: {
    week: "week",
    brand: "brand",
    market: "market",
    outcome: "new_customers",
    channels: [
      { column: "spend_search", channel: "search" },
      { column: "spend_radio", channel: "radio" },
    ],
    controls: [],
    ignored: [],
  },
  cells,
  report: null,
  summary: null,
};

export function testDatasetSeries(cellId: string): DatasetSeries {
  const cell = cells.find((c) => c.cellId === cellId)!;
  const scale = cellId === "c1" ? 1 : 0.4;
  return {
    datasetVersionId: "dv-1",
    cell,
    channels: ["search", "radio"],
    controls: [],
    weeks,
    outcome: weeks.map((_, t) => Math.round(scale * (400 + 30 * Math.sin(t / 3) + (t % 4) * 5))),
    spend: [weeks.map((_, t) => Math.round(scale * (1000 + 200 * (t % 3)))), weeks.map((_, t) => (t % 5 === 0 ? 0 : Math.round(scale * 600)))],
    controlValues: [],
  };
}
