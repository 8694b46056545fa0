import { zodResolver } from "@hookform/resolvers/zod";
import { INVITATION_VALID_HOURS, roleLabels, roles, type Invitation, type Market } from "@tributary/contracts";
import { useState } from "react";
import { Controller, useForm } from "react-hook-form";
import { Button } from "../../../components/ui/button";
import { describedBy, inputClass } from "../../../components/ui/field";
import { ApiError } from "../../../lib/api-client";
import { createInvitationInput, useCreateInvitation, type CreateInvitationInput } from "../api/create-invitation";
import { MarketChoice } from "./market-choice";

/** Invite someone by e-mail with a role (and, for a market manager, their markets). */
export function InviteForm({ markets }: { markets: readonly Market[] }) {
  const form = useForm<CreateInvitationInput>({ resolver: zodResolver(createInvitationInput), defaultValues: { email: "", role: "market_manager", marketIds: [] } });
  const invite = useCreateInvitation();
  const [sent, setSent] = useState<Invitation | null>(null);
  const { errors } = form.formState;
  const role = form.watch("role");

  const submit = form.handleSubmit((values) => {
    setSent(null);
    invite.mutate(
      { ...values, marketIds: values.role === "market_manager" ? values.marketIds : [] },
      {
        onSuccess: (invitation) => {
          setSent(invitation);
          form.reset({ email: "", role: values.role, marketIds: [] });
        },
        onError: (error) => {
          if (!(error instanceof ApiError)) return;
          for (const issue of error.issues) {
            const field = issue.path.split(".")[0];
            if (field === "email" || field === "role" || field === "marketIds") form.setError(field, { type: "server", message: issue.message });
          }
        },
      },
    );
  });
  const serverError = invite.error instanceof ApiError && invite.error.issues.length > 0 ? null : invite.error;

  return (
    <form onSubmit={submit} noValidate aria-label="Invite someone" className="space-y-4 rounded-lg border border-line bg-surface p-5 shadow-card">
      <h2 className="text-heading font-semibold text-ink-900">Invite someone</h2>
      <p className="text-small text-ink-700">They get an e-mail with a link to set their name and password. The link works once, for {INVITATION_VALID_HOURS} hours.</p>
      <div className="flex flex-wrap items-start gap-4">
        <div>
          <label htmlFor="invite-email" className="block text-small font-medium text-ink-800">
            E-mail address
          </label>
          <input
            id="invite-email"
            type="email"
            autoComplete="off"
            className={`${inputClass} mt-1 w-72`}
            aria-invalid={errors.email ? true : undefined}
            aria-describedby={describedBy("invite-email", { error: errors.email })}
            {...form.register("email")}
          />
          {errors.email ? (
            <p id="invite-email-error" className="mt-1 text-caption font-medium text-alert-700">
              {errors.email.message}
            </p>
          ) : null}
        </div>
        <div>
          <label htmlFor="invite-role" className="block text-small font-medium text-ink-800">
            Role
          </label>
          <Controller
            control={form.control}
            name="role"
            render={({ field }) => (
              <select
                id="invite-role"
                className={`${inputClass} mt-1 w-48`}
                name={field.name}
                ref={field.ref}
                value={field.value}
                onBlur={field.onBlur}
                onChange={(event) => {
                  field.onChange(event.target.value);
                  // Other roles see every market: their invitation names none.
                  if (event.target.value !== "market_manager") form.setValue("marketIds", []);
                }}
              >
                {roles.map((r) => (
                  <option key={r} value={r}>
                    {roleLabels[r]}
                  </option>
                ))}
              </select>
            )}
          />
        </div>
      </div>
      {role === "market_manager" ? (
        <Controller
          control={form.control}
          name="marketIds"
          render={({ field, fieldState }) => <MarketChoice idPrefix="invite-markets" markets={markets} value={field.value ?? []} onChange={field.onChange} error={fieldState.error?.message} />}
        />
      ) : (
        <p className="text-small text-ink-700">{roleLabels[role]}s see every market.</p>
      )}
      {serverError ? (
        <p role="alert" className="text-small font-medium text-alert-700">
          {serverError instanceof ApiError ? serverError.message : "The invitation could not be sent. Please try again."}
        </p>
      ) : null}
      {sent ? (
        <p role="status" className="text-small font-medium text-ok-700">
          Invitation sent to {sent.email} as {roleLabels[sent.role]}
          {sent.markets.length > 0 ? ` for ${sent.markets.map((m) => m.name).join(", ")}` : ""}. The e-mail is in the Outbox.
        </p>
      ) : null}
      <Button type="submit" disabled={invite.isPending}>
        {invite.isPending ? "Sending…" : "Send invitation"}
      </Button>
    </form>
  );
}
