import { BudgetSplit } from "../../../features/budget-split/components/budget-split";

export default function BudgetSplitRoute() {
  return <BudgetSplit />;
}
