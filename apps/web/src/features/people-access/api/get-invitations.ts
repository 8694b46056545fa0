import { invitationSchema, type Invitation, type InvitationStatus } from "@tributary/contracts";
import { queryOptions, useQuery } from "@tanstack/react-query";
import { z } from "zod";
import { api } from "../../../lib/api-client";

/** GET /api/invitations?status=…: invitations, newest first (admins; the token is never sent). */
export function getInvitations(status?: InvitationStatus): Promise<Invitation[]> {
  return api.get(`/api/invitations${status ? `?status=${status}` : ""}`, z.array(invitationSchema));
}

export const invitationsQueryKey = ["invitations", "list"] as const;

export const invitationsQueryOptions = (status?: InvitationStatus) =>
  queryOptions({ queryKey: [...invitationsQueryKey, status ?? "all"] as const, queryFn: () => getInvitations(status) });

export function useInvitations(status?: InvitationStatus) {
  return useQuery(invitationsQueryOptions(status));
}
