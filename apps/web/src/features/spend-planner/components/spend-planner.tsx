import { EmptyState } from "../../../components/ui/empty-state";
import { ModelCaution } from "../../../components/ui/model-caution";
import { PageHeader } from "../../../components/ui/page-header";
import { ScreenOutline } from "../../../components/ui/screen-outline";

const outline = [
  "Scenarios for the next weeks: spend changes per market and channel",
  "The forecast outcome with intervals, against the current plan",
  "Save scenarios and compare them side by side",
];

export function SpendPlanner({ scopedToMarkets }: { scopedToMarkets: boolean }) {
  return (
    <>
      <PageHeader
        title="Spend planner"
        description="Try spend changes for the weeks ahead and see what the model expects, with its uncertainty."
      />
      {scopedToMarkets ? (
        <p className="mb-4 text-small text-ink-700">You will see your own markets only.</p>
      ) : null}
      <div className="mb-6">
        <ModelCaution />
      </div>
      <ScreenOutline items={outline} />
      <EmptyState title="No scenarios to show">
        Planning needs a published fit; this screen shows no scenarios until one exists.
      </EmptyState>
    </>
  );
}
