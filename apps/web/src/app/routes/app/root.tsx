import { roleLabels, type CurrentUser } from "@tributary/contracts";
import { useQuery, type QueryClient } from "@tanstack/react-query";
import { Suspense, useEffect } from "react";
import { Navigate, Outlet, redirect, useLocation, useNavigate, useNavigation, type LoaderFunctionArgs } from "react-router-dom";
import { AppShell } from "../../../components/layout/app-shell";
import { LoadingState } from "../../../components/ui/loading-state";
import { paths } from "../../../config/paths";
import { currentUserQueryOptions, useCurrentUser } from "../../../features/auth/api/get-current-user";
import { useSignOut } from "../../../features/auth/api/sign-out";
import { portfolioQueryOptions } from "../../../features/portfolio-map/api/get-portfolio";
import { homeScreenFor, navigationFor } from "../../../lib/authorization";

export const clientLoader =
  (queryClient: QueryClient) =>
  async ({ request }: LoaderFunctionArgs) => {
    const user = await queryClient.ensureQueryData(currentUserQueryOptions());
    if (!user) {
      const url = new URL(request.url);
      throw redirect(paths.auth.signIn.getHref(url.pathname + url.search));
    }
    return null;
  };

function useMarketScopeLabel(user: CurrentUser): string | null {
  const scoped = user.role === "market_manager";
  const portfolio = useQuery({ ...portfolioQueryOptions(), enabled: scoped });
  if (!scoped) return null;
  const names = portfolio.data?.markets.filter((market) => user.marketIds.includes(market.id)).map((market) => market.name);
  if (names && names.length > 0) return `Markets: ${names.join(", ")}`;
  const count = user.marketIds.length;
  return count === 0 ? "No markets assigned yet" : `${count} ${count === 1 ? "market" : "markets"} assigned`;
}

function SignedInApp({ user }: { user: CurrentUser }) {
  const navigate = useNavigate();
  const navigation = useNavigation();
  const location = useLocation();
  const signOut = useSignOut({ onSuccess: () => navigate(paths.auth.signIn.getHref(), { replace: true }) });
  const signOutEverywhere = useSignOut({ everywhere: true, onSuccess: () => navigate(paths.auth.signIn.getHref(), { replace: true }) });
  const scopeLabel = useMarketScopeLabel(user);

  // Move focus to the new screen so keyboard and screen-reader users start at its top;
  // a fresh page load (key "default") keeps the browser's own starting point.
  const freshLoad = location.key === "default";
  useEffect(() => {
    if (!freshLoad) document.getElementById("main")?.focus();
    // Only a change of screen moves focus; search-parameter changes (filters) must not.
  }, [location.pathname]);

  return (
    <AppShell
      user={{ name: user.name, email: user.email, roleLabel: roleLabels[user.role], scopeLabel }}
      navigation={navigationFor(user.role)}
      homeHref={paths.app[homeScreenFor(user.role)].getHref()}
      onSignOut={() => signOut.mutate()}
      onSignOutEverywhere={() => signOutEverywhere.mutate()}
      signingOut={signOut.isPending || signOutEverywhere.isPending}
      busy={navigation.state === "loading"}
    >
      {signOut.isError || signOutEverywhere.isError ? (
        <p role="alert" className="mb-4 rounded-md bg-alert-100 px-3 py-2 text-small text-alert-700">
          Signing out failed: {(signOut.error ?? signOutEverywhere.error)?.message}
        </p>
      ) : null}
      <Suspense fallback={<LoadingState />}>
        <Outlet />
      </Suspense>
    </AppShell>
  );
}

export default function AppRoot() {
  const { data: user, isPending } = useCurrentUser();
  if (isPending) return <LoadingState />;
  if (!user) return <Navigate to={paths.auth.signIn.getHref()} replace />;
  return <SignedInApp user={user} />;
}
