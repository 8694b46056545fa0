import { useSignedInUser } from "../../../features/auth/api/get-current-user";
import { SpendPlanner } from "../../../features/spend-planner/components/spend-planner";

export default function SpendPlannerRoute() {
  const user = useSignedInUser();
  return <SpendPlanner user={user} />;
}
