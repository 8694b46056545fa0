import type { QueryClient } from "@tanstack/react-query";
import { useEffect } from "react";
import { redirect, useNavigate, useSearchParams, type LoaderFunctionArgs } from "react-router-dom";
import { AuthLayout } from "../../components/layout/auth-layout";
import { paths, safeRedirectTarget } from "../../config/paths";
import { currentUserQueryOptions } from "../../features/auth/api/get-current-user";
import { SignInForm } from "../../features/auth/components/sign-in-form";

export const clientLoader =
  (queryClient: QueryClient) =>
  async ({ request }: LoaderFunctionArgs) => {
    const user = await queryClient.ensureQueryData(currentUserQueryOptions());
    if (!user) return null;
    const target = safeRedirectTarget(new URL(request.url).searchParams.get("redirectTo"));
    return redirect(target ?? paths.home.getHref());
  };

export default function SignInRoute() {
  const navigate = useNavigate();
  const [searchParams] = useSearchParams();
  const target = safeRedirectTarget(searchParams.get("redirectTo")) ?? paths.home.getHref();
  useEffect(() => {
    document.title = "Sign in · Tributary";
  }, []);
  return (
    <AuthLayout title="Sign in to Tributary">
      <SignInForm onSuccess={() => navigate(target, { replace: true })} />
    </AuthLayout>
  );
}
