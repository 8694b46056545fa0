import { EmptyState } from "../../../components/ui/empty-state";
import { PageHeader } from "../../../components/ui/page-header";
import { ScreenOutline } from "../../../components/ui/screen-outline";

const outline = [
  "Pick a dataset version",
  "Per channel, a plausible range for cost per new customer",
  "Carry-over length, saturation form, likelihood and seasonality order",
  "Pooling structure and the weeks held out to test accuracy",
  "A live prior check in the browser: what the priors alone imply, before any fit",
];

export function ModelSetup() {
  return (
    <>
      <PageHeader
        title="Model setup"
        description="Say what the team already knows before any fit: the priors and the shape of the model."
      />
      <ScreenOutline items={outline} />
      <EmptyState title="Nothing here yet">
        This screen is not connected yet, so it shows no saved model setups.
      </EmptyState>
    </>
  );
}
