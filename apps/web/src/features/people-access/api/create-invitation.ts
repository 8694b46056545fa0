import { invitationInput, invitationSchema, type Invitation, type InvitationInput } from "@tributary/contracts";
import { useMutation, useQueryClient } from "@tanstack/react-query";
import { z } from "zod";
import { api } from "../../../lib/api-client";
import { auditLogQueryKey } from "./get-audit-log";
import { invitationsQueryKey } from "./get-invitations";

/**
 * The invitation form: the API's input, with a market manager's markets required and no
 * markets for other roles (checked even while the address is not valid, so every
 * problem shows at once).
 */
export const createInvitationInput = invitationInput
  .refine((value) => value.role !== "market_manager" || (value.marketIds ?? []).length > 0, {
    path: ["marketIds"],
    message: "Choose at least one market for a market manager",
    when: () => true,
  })
  .refine((value) => value.role === "market_manager" || (value.marketIds ?? []).length === 0, {
    path: ["marketIds"],
    message: "Only market managers are limited to markets; this role sees every market",
    when: () => true,
  });
export type CreateInvitationInput = z.input<typeof createInvitationInput>;

/** POST /api/invitations: e-mails a one-time link (valid 72 hours) to set a password. */
export function createInvitation(input: InvitationInput): Promise<Invitation> {
  return api.post("/api/invitations", invitationSchema, createInvitationInput.parse(input));
}

export function useCreateInvitation() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: createInvitation,
    onSuccess: () =>
      Promise.all([
        queryClient.invalidateQueries({ queryKey: invitationsQueryKey }),
        queryClient.invalidateQueries({ queryKey: auditLogQueryKey }),
      ]),
  });
}
