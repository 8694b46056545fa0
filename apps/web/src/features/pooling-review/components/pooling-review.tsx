import { EmptyState } from "../../../components/ui/empty-state";
import { PageHeader } from "../../../components/ui/page-header";
import { ScreenOutline } from "../../../components/ui/screen-outline";

const outline = [
  "Per cell, the unpooled and the pooled estimate, with an arrow for how far pooling moved it",
  "Pooling factors for each level of the hierarchy",
  "Candidate outliers: cells that pooling pulled hard",
  "Flags with a reason (data problem, real difference, needs a lift test) and a note; flags show on every screen",
];

export function PoolingReview() {
  return (
    <>
      <PageHeader
        title="Pooling review"
        description="See how far pooling moved each cell's estimate, and flag the ones that need a closer look."
      />
      <ScreenOutline items={outline} />
      <EmptyState title="No run to review">
        The review needs a finished run, and this screen is not connected to any run yet.
      </EmptyState>
    </>
  );
}
