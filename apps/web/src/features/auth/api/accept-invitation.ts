import { acceptInvitationInput, currentUserSchema, passwordProblems, PASSWORD_MIN_LENGTH, type AcceptInvitationInput, type CurrentUser } from "@tributary/contracts";
import { useMutation, useQueryClient } from "@tanstack/react-query";
import { z } from "zod";
import { api } from "../../../lib/api-client";
import { currentUserQueryOptions } from "./get-current-user";

/**
 * The acceptance form: the API's input plus the password rules for this e-mail address
 * and a repeated password, so every rule is checked before anything is sent.
 */
export const acceptInvitationForm = (email: string) =>
  acceptInvitationInput
    .extend({
      password: z.string("Choose a password").min(1, `Choose a password of at least ${PASSWORD_MIN_LENGTH} characters`),
      repeatPassword: z.string(),
    })
    .superRefine((value, ctx) => {
      const problems = passwordProblems(value.password, email);
      if (value.password.length > 0 && problems.length > 0) ctx.addIssue({ code: "custom", path: ["password"], message: problems.join(". ") });
      if (value.repeatPassword !== value.password) ctx.addIssue({ code: "custom", path: ["repeatPassword"], message: "The two passwords are not the same" });
    });
export type AcceptInvitationForm = z.input<ReturnType<typeof acceptInvitationForm>>;

/** POST /api/invitations/:token/accept (public): creates the account and signs the person in. */
export function acceptInvitation({ token, ...input }: AcceptInvitationInput & { token: string }): Promise<CurrentUser> {
  return api.post(`/api/invitations/${encodeURIComponent(token)}/accept`, currentUserSchema, acceptInvitationInput.parse(input), { redirectOnUnauthenticated: false });
}

export function useAcceptInvitation({ onSuccess }: { onSuccess?: (user: CurrentUser) => void } = {}) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: acceptInvitation,
    onSuccess: (user) => {
      // A new person is signed in: nothing cached for anyone before may stay.
      queryClient.removeQueries();
      queryClient.setQueryData(currentUserQueryOptions().queryKey, user);
      onSuccess?.(user);
    },
  });
}
