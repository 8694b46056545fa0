import { EmptyState } from "../../../components/ui/empty-state";
import { PageHeader } from "../../../components/ui/page-header";
import { ScreenOutline } from "../../../components/ui/screen-outline";

const outline = [
  "Fit jobs with live progress per chain and the time left; cancel a run; the reason a run failed",
  "For a finished run: convergence diagnostics (R-hat, effective sample size, divergences)",
  "Posterior predictive check and holdout accuracy",
  "Publish a sound run as the current fit",
];

export function Runs() {
  return (
    <>
      <PageHeader
        title="Runs"
        description="Fits of the portfolio model: follow them while they run, and check them before anyone relies on them."
      />
      <ScreenOutline items={outline} />
      <EmptyState title="No runs to show">
        This screen is not connected to the fit runner yet, so it lists no runs.
      </EmptyState>
    </>
  );
}
