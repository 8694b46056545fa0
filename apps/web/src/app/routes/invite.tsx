import { useEffect } from "react";
import { Link, useNavigate, useParams } from "react-router-dom";
import { AuthLayout } from "../../components/layout/auth-layout";
import { LoadingState } from "../../components/ui/loading-state";
import { paths } from "../../config/paths";
import { useInvitation } from "../../features/auth/api/get-invitation";
import { AcceptInvitationForm } from "../../features/auth/components/accept-invitation-form";
import { ApiError } from "../../lib/api-client";

/** A message as a sentence, with its full stop. */
const sentence = (text: string) => (/[.!?]$/.test(text.trim()) ? text.trim() : `${text.trim()}.`);

/** The public page an invitation e-mail links to: name and password, then straight into the app. */
export default function InviteRoute() {
  const { token = "" } = useParams();
  const navigate = useNavigate();
  const invitation = useInvitation(token);
  useEffect(() => {
    document.title = "Accept your invitation · Tributary";
  }, []);
  const failure = invitation.error;
  return (
    <AuthLayout title={failure ? "This invitation link does not work" : "Accept your invitation"}>
      {invitation.isPending ? (
        <LoadingState label="Checking the invitation…" />
      ) : failure ? (
        <div className="space-y-4">
          <div role="alert" className="rounded-md border border-alert-700/30 bg-alert-100 px-3 py-2 text-small text-alert-700">
            {failure instanceof ApiError && (failure.status === 404 || failure.status === 409 || failure.status === 429)
              ? sentence(failure.message)
              : "The invitation could not be checked. Please try again in a moment."}
          </div>
          <p className="text-small text-ink-700">
            Already have an account?{" "}
            <Link to={paths.auth.signIn.getHref()} className="font-medium text-stream-700 underline">
              Sign in
            </Link>
            .
          </p>
        </div>
      ) : (
        <AcceptInvitationForm token={token} invitation={invitation.data} onAccepted={() => navigate(paths.home.getHref(), { replace: true })} />
      )}
    </AuthLayout>
  );
}
