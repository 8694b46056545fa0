import { EmptyState } from "../../../components/ui/empty-state";
import { ModelCaution } from "../../../components/ui/model-caution";
import { PageHeader } from "../../../components/ui/page-header";
import { ScreenOutline } from "../../../components/ui/screen-outline";

const outline = [
  "A total budget, with lower and upper bounds per channel and market",
  "The objective: new customers, or profit using each brand's customer value",
  "Your attitude to risk",
  "The recommended allocation and the distribution of its outcome",
  "Save the split as a plan for the portfolio lead to approve",
];

export function BudgetSplit() {
  return (
    <>
      <PageHeader
        title="Budget split"
        description="Split a total budget across channels and markets where it is expected to earn most."
      />
      <div className="mb-6">
        <ModelCaution />
      </div>
      <ScreenOutline items={outline} />
      <EmptyState title="No plans to show">
        A split needs a published fit; this screen shows no plans until one exists.
      </EmptyState>
    </>
  );
}
