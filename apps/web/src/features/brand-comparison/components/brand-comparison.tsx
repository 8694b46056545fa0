import { EmptyState } from "../../../components/ui/empty-state";
import { PageHeader } from "../../../components/ui/page-header";
import { ScreenOutline } from "../../../components/ui/screen-outline";

const outline = [
  "For each channel, every brand's cost per new customer with its credible interval, side by side",
  "Sorted so the cheapest and dearest brands for a channel stand out",
  "The portfolio-wide channel effect as a reference band behind the brands",
  "Flags analysts raised on a cell, shown beside its interval",
];

export function BrandComparison({ scopedToMarkets }: { scopedToMarkets: boolean }) {
  return (
    <>
      <PageHeader
        title="Brand comparison"
        description="What each channel costs per new customer in each brand, side by side."
      />
      {scopedToMarkets ? (
        <p className="mb-4 text-small text-ink-700">You will see your own markets only.</p>
      ) : null}
      <ScreenOutline items={outline} />
      <EmptyState title="No published fit yet">
        The comparison needs a published fit. Once an analyst publishes one, each brand's interval per channel appears here.
      </EmptyState>
    </>
  );
}
