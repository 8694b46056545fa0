import { invitationSchema, type Invitation } from "@tributary/contracts";
import { useMutation, useQueryClient } from "@tanstack/react-query";
import { api } from "../../../lib/api-client";
import { auditLogQueryKey } from "./get-audit-log";
import { invitationsQueryKey } from "./get-invitations";

/** POST /api/invitations/:invitationId/resend: a new link and 72 more hours; the old link stops working. */
export function resendInvitation(invitationId: string): Promise<Invitation> {
  return api.post(`/api/invitations/${encodeURIComponent(invitationId)}/resend`, invitationSchema);
}

export function useResendInvitation() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: resendInvitation,
    onSuccess: () =>
      Promise.all([
        queryClient.invalidateQueries({ queryKey: invitationsQueryKey }),
        queryClient.invalidateQueries({ queryKey: auditLogQueryKey }),
      ]),
  });
}
