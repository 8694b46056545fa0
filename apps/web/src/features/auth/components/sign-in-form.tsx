import { zodResolver } from "@hookform/resolvers/zod";
import type { CurrentUser } from "@tributary/contracts";
import { useForm } from "react-hook-form";
import type { z } from "zod";
import { Button } from "../../../components/ui/button";
import { ApiError } from "../../../lib/api-client";
import { signInInput, useSignIn, type SignInInput } from "../api/sign-in";

type SignInFormProps = { onSuccess: (user: CurrentUser) => void };

const fieldClass =
  "mt-1 block w-full rounded-md border bg-surface px-3 py-2 text-body text-ink-900 aria-[invalid=true]:border-alert-700";

export function SignInForm({ onSuccess }: SignInFormProps) {
  const form = useForm<z.input<typeof signInInput>, unknown, SignInInput>({
    resolver: zodResolver(signInInput),
    defaultValues: { email: "", password: "" },
  });
  const signInMutation = useSignIn({ onSuccess });
  const { errors } = form.formState;

  const onSubmit = form.handleSubmit((values) => {
    signInMutation.mutate(values, {
      onError: (error) => {
        if (!(error instanceof ApiError)) return;
        for (const issue of error.issues) {
          if (issue.path === "email" || issue.path === "password") {
            form.setError(issue.path, { type: "server", message: issue.message });
          }
        }
      },
    });
  });

  const serverError = signInMutation.error;
  const serverMessage =
    serverError instanceof ApiError
      ? serverError.status === 401
        ? "That e-mail and password do not match an account. Check both and try again."
        : serverError.message
      : serverError
        ? "Signing in failed. Please try again."
        : null;

  return (
    <form onSubmit={onSubmit} noValidate aria-label="Sign in" className="space-y-5">
      {serverMessage ? (
        <div role="alert" className="rounded-md border border-alert-700/30 bg-alert-100 px-3 py-2 text-small text-alert-700">
          {serverMessage}
        </div>
      ) : null}
      <div>
        <label htmlFor="sign-in-email" className="text-small font-medium text-ink-800">
          E-mail
        </label>
        <input
          id="sign-in-email"
          type="email"
          autoComplete="username"
          aria-invalid={errors.email ? true : undefined}
          aria-describedby={errors.email ? "sign-in-email-error" : undefined}
          className={`${fieldClass} ${errors.email ? "border-alert-700" : "border-field"}`}
          {...form.register("email")}
        />
        {errors.email ? (
          <p id="sign-in-email-error" className="mt-1 text-small text-alert-700">
            {errors.email.message}
          </p>
        ) : null}
      </div>
      <div>
        <label htmlFor="sign-in-password" className="text-small font-medium text-ink-800">
          Password
        </label>
        <input
          id="sign-in-password"
          type="password"
          autoComplete="current-password"
          aria-invalid={errors.password ? true : undefined}
          aria-describedby={errors.password ? "sign-in-password-error" : undefined}
          className={`${fieldClass} ${errors.password ? "border-alert-700" : "border-field"}`}
          {...form.register("password")}
        />
        {errors.password ? (
          <p id="sign-in-password-error" className="mt-1 text-small text-alert-700">
            {errors.password.message}
          </p>
        ) : null}
      </div>
      <Button type="submit" className="w-full py-2.5" disabled={signInMutation.isPending}>
        {signInMutation.isPending ? "Signing in…" : "Sign in"}
      </Button>
    </form>
  );
}
