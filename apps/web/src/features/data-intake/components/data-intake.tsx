import { EmptyState } from "../../../components/ui/empty-state";
import { PageHeader } from "../../../components/ui/page-header";
import { ScreenOutline } from "../../../components/ui/screen-outline";

const outline = [
  "Upload a tidy CSV: one row per week, brand and market",
  "Map its columns to roles: week, brand, market, outcome, spend per channel, controls",
  "A validation report: gaps, duplicates, negative values, partial weeks, suspicious spikes",
  "A preview chart, then save as a dataset version that never changes afterwards",
  "Lift tests, entered by hand or uploaded",
];

export function DataIntake() {
  return (
    <>
      <PageHeader
        title="Data intake"
        description="Bring in the weekly data the model learns from, check it, and keep every version."
      />
      <ScreenOutline items={outline} />
      <EmptyState title="Nothing here yet">
        This screen is not connected yet, so it shows no uploads or dataset versions. The Portfolio map already shows how many weeks of data each cell holds.
      </EmptyState>
    </>
  );
}
