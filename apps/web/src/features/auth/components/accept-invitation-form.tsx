import { zodResolver } from "@hookform/resolvers/zod";
import { commonPasswords, PASSWORD_MIN_LENGTH, roleLabels, type CurrentUser, type InvitationLookup } from "@tributary/contracts";
import { useMemo } from "react";
import { useForm } from "react-hook-form";
import { Button } from "../../../components/ui/button";
import { ApiError } from "../../../lib/api-client";
import { formatDateTime } from "../../../lib/format";
import { acceptInvitationForm, useAcceptInvitation, type AcceptInvitationForm as FormValues } from "../api/accept-invitation";

const fieldClass = "mt-1 block w-full rounded-md border bg-surface px-3 py-2 text-body text-ink-900 aria-[invalid=true]:border-alert-700";

type AcceptInvitationFormProps = { token: string; invitation: InvitationLookup; onAccepted: (user: CurrentUser) => void };

/** The rules a new password must meet, each marked as met or not while the person types. */
function PasswordRules({ password, email }: { password: string; email: string }) {
  const lower = password.trim().toLowerCase();
  const local = email.toLowerCase().split("@")[0] ?? "";
  const rules = [
    { text: `At least ${PASSWORD_MIN_LENGTH} characters`, met: password.length >= PASSWORD_MIN_LENGTH },
    { text: "Not your e-mail address or the part before @", met: password.length > 0 && lower !== email.toLowerCase() && lower !== local },
    { text: "Not a common password", met: password.length > 0 && !commonPasswords.includes(lower) },
  ];
  return (
    <ul id="invite-password-rules" className="mt-2 space-y-1 text-small" aria-label="Password rules">
      {rules.map((rule) => (
        <li key={rule.text} className={`flex items-center gap-2 ${rule.met ? "text-ok-700" : "text-ink-700"}`}>
          <span aria-hidden="true" className="inline-block w-4 text-center">
            {rule.met ? "✓" : "·"}
          </span>
          {rule.text}
          <span className="sr-only">{rule.met ? " (met)" : " (not met yet)"}</span>
        </li>
      ))}
    </ul>
  );
}

/** Name and password for a new account from an invitation. */
export function AcceptInvitationForm({ token, invitation, onAccepted }: AcceptInvitationFormProps) {
  const schema = useMemo(() => acceptInvitationForm(invitation.email), [invitation.email]);
  const form = useForm<FormValues>({ resolver: zodResolver(schema), defaultValues: { name: "", password: "", repeatPassword: "" } });
  const accept = useAcceptInvitation({ onSuccess: onAccepted });
  const { errors } = form.formState;
  const password = form.watch("password");

  const onSubmit = form.handleSubmit((values) => {
    accept.mutate(
      { token, name: values.name, password: values.password },
      {
        onError: (error) => {
          if (!(error instanceof ApiError)) return;
          for (const issue of error.issues) if (issue.path === "name" || issue.path === "password") form.setError(issue.path, { type: "server", message: issue.message });
        },
      },
    );
  });
  const serverError = accept.error instanceof ApiError && accept.error.issues.length > 0 ? null : accept.error;

  return (
    <form onSubmit={onSubmit} noValidate aria-label="Accept the invitation" className="space-y-5">
      <p className="text-body text-ink-800">
        You are invited to <strong className="font-semibold">{invitation.company}</strong>'s Tributary workspace as{" "}
        <strong className="font-semibold">{roleLabels[invitation.role]}</strong>, with the e-mail address <strong className="font-semibold">{invitation.email}</strong>. The link works
        until {formatDateTime(invitation.expiresAt)}, once.
      </p>
      {serverError ? (
        <div role="alert" className="rounded-md border border-alert-700/30 bg-alert-100 px-3 py-2 text-small text-alert-700">
          {serverError instanceof ApiError ? serverError.message : "Creating the account failed. Please try again."}
        </div>
      ) : null}
      <div>
        <label htmlFor="invite-name" className="text-small font-medium text-ink-800">
          Your name
        </label>
        <input
          id="invite-name"
          autoComplete="name"
          aria-invalid={errors.name ? true : undefined}
          aria-describedby={errors.name ? "invite-name-error" : undefined}
          className={`${fieldClass} ${errors.name ? "border-alert-700" : "border-field"}`}
          {...form.register("name")}
        />
        {errors.name ? (
          <p id="invite-name-error" className="mt-1 text-small text-alert-700">
            {errors.name.message}
          </p>
        ) : null}
      </div>
      <div>
        <label htmlFor="invite-password" className="text-small font-medium text-ink-800">
          Choose a password
        </label>
        <input
          id="invite-password"
          type="password"
          autoComplete="new-password"
          aria-invalid={errors.password ? true : undefined}
          aria-describedby={`invite-password-rules${errors.password ? " invite-password-error" : ""}`}
          className={`${fieldClass} ${errors.password ? "border-alert-700" : "border-field"}`}
          {...form.register("password")}
        />
        <PasswordRules password={password ?? ""} email={invitation.email} />
        {errors.password ? (
          <p id="invite-password-error" className="mt-1 text-small text-alert-700">
            {errors.password.message}
          </p>
        ) : null}
      </div>
      <div>
        <label htmlFor="invite-repeat" className="text-small font-medium text-ink-800">
          Repeat the password
        </label>
        <input
          id="invite-repeat"
          type="password"
          autoComplete="new-password"
          aria-invalid={errors.repeatPassword ? true : undefined}
          aria-describedby={errors.repeatPassword ? "invite-repeat-error" : undefined}
          className={`${fieldClass} ${errors.repeatPassword ? "border-alert-700" : "border-field"}`}
          {...form.register("repeatPassword")}
        />
        {errors.repeatPassword ? (
          <p id="invite-repeat-error" className="mt-1 text-small text-alert-700">
            {errors.repeatPassword.message}
          </p>
        ) : null}
      </div>
      <Button type="submit" className="w-full py-2.5" disabled={accept.isPending}>
        {accept.isPending ? "Creating your account…" : "Create my account"}
      </Button>
    </form>
  );
}
