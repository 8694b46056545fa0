import type { QueryClient } from "@tanstack/react-query";
import { useSignedInUser } from "../../../features/auth/api/get-current-user";
import { currentDrawSetQueryOptions } from "../../../features/spend-planner/api/get-current-draw-set";
import { SpendPlanner } from "../../../features/spend-planner/components/spend-planner";

// Starts loading the draws with the route; the screen shows its own loading and error states.
export const clientLoader = (queryClient: QueryClient) => async () => {
  void queryClient.prefetchQuery(currentDrawSetQueryOptions());
  return null;
};

export default function SpendPlannerRoute() {
  const user = useSignedInUser();
  return <SpendPlanner user={user} />;
}
