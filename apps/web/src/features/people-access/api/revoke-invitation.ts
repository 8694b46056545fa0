import { invitationSchema, type Invitation } from "@tributary/contracts";
import { useMutation, useQueryClient } from "@tanstack/react-query";
import { api } from "../../../lib/api-client";
import { auditLogQueryKey } from "./get-audit-log";
import { invitationsQueryKey } from "./get-invitations";

/** POST /api/invitations/:invitationId/revoke: the link stops working. */
export function revokeInvitation(invitationId: string): Promise<Invitation> {
  return api.post(`/api/invitations/${encodeURIComponent(invitationId)}/revoke`, invitationSchema);
}

export function useRevokeInvitation() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: revokeInvitation,
    onSuccess: () =>
      Promise.all([
        queryClient.invalidateQueries({ queryKey: invitationsQueryKey }),
        queryClient.invalidateQueries({ queryKey: auditLogQueryKey }),
      ]),
  });
}
