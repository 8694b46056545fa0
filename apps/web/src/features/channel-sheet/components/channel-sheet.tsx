import { EmptyState } from "../../../components/ui/empty-state";
import { PageHeader } from "../../../components/ui/page-header";
import { ScreenOutline } from "../../../components/ui/screen-outline";

const outline = [
  "Cost per new customer at low spend and at the margin of current spend, as full distributions",
  "The response curve with credible bands",
  "The carry-over profile: how long a week's spend keeps working",
  "Weekly contribution of the channel over time",
  "The chance of profit, against a customer-value slider you can move",
];

export function ChannelSheet() {
  return (
    <>
      <PageHeader
        title="Channel sheet"
        description="One brand in one market, one channel: everything the model says about what that channel costs."
      />
      <ScreenOutline items={outline} />
      <EmptyState title="No published fit yet">
        A channel sheet needs a published fit. Once an analyst publishes one, you pick a cell and a channel here.
      </EmptyState>
    </>
  );
}
