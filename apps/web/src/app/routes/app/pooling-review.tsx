import { PoolingReview } from "../../../features/pooling-review/components/pooling-review";

export default function PoolingReviewRoute() {
  return <PoolingReview />;
}
