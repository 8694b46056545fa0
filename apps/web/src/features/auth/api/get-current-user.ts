import { currentUserSchema, type CurrentUser } from "@tributary/contracts";
import { queryOptions, useQuery, useSuspenseQuery } from "@tanstack/react-query";
import { api, ApiError } from "../../../lib/api-client";

/** The signed-in user, or null when nobody is signed in. */
export async function getCurrentUser(): Promise<CurrentUser | null> {
  try {
    return await api.get("/api/auth/me", currentUserSchema, { redirectOnUnauthenticated: false });
  } catch (error) {
    if (error instanceof ApiError && error.status === 401) return null;
    throw error;
  }
}

export const currentUserQueryOptions = () =>
  queryOptions({ queryKey: ["auth", "me"] as const, queryFn: getCurrentUser, staleTime: Infinity });

export function useCurrentUser() {
  return useQuery(currentUserQueryOptions());
}

/** For screens inside the signed-in area, where the app layout has already made sure of a user. */
export function useSignedInUser(): CurrentUser {
  const { data } = useSuspenseQuery(currentUserQueryOptions());
  if (!data) throw new ApiError(401, "unauthenticated", "Please sign in again.");
  return data;
}
