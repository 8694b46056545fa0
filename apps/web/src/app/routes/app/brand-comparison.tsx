import { useSignedInUser } from "../../../features/auth/api/get-current-user";
import { BrandComparison } from "../../../features/brand-comparison/components/brand-comparison";

export default function BrandComparisonRoute() {
  const user = useSignedInUser();
  return <BrandComparison scopedToMarkets={user.role === "market_manager"} />;
}
