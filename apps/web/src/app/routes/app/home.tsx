import { Navigate } from "react-router-dom";
import { paths } from "../../../config/paths";
import { useSignedInUser } from "../../../features/auth/api/get-current-user";
import { homeScreenFor } from "../../../lib/authorization";

/** "/" sends each role to its own home screen. */
export default function HomeRoute() {
  const user = useSignedInUser();
  return <Navigate to={paths.app[homeScreenFor(user.role)].getHref()} replace />;
}
