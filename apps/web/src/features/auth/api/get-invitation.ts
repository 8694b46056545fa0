import { invitationLookupSchema, type InvitationLookup } from "@tributary/contracts";
import { queryOptions, useQuery } from "@tanstack/react-query";
import { api } from "../../../lib/api-client";

/** GET /api/invitations/:token (public): who the invitation is for, or why the link no longer works. */
export function getInvitation(token: string): Promise<InvitationLookup> {
  return api.get(`/api/invitations/${encodeURIComponent(token)}`, invitationLookupSchema, { redirectOnUnauthenticated: false });
}

export const invitationQueryOptions = (token: string) =>
  queryOptions({ queryKey: ["invitations", "lookup", token] as const, queryFn: () => getInvitation(token), retry: false, staleTime: 30_000 });

export function useInvitation(token: string) {
  return useQuery(invitationQueryOptions(token));
}
