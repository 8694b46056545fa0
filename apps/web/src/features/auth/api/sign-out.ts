import { useMutation, useQueryClient } from "@tanstack/react-query";
import { api } from "../../../lib/api-client";
import { currentUserQueryOptions } from "./get-current-user";

export function signOut(): Promise<void> {
  return api.post<void>("/api/auth/sign-out", null, undefined, { redirectOnUnauthenticated: false });
}

/** Ends every session of the user: this browser's and those on any other device. */
export function signOutEverywhere(): Promise<void> {
  return api.post<void>("/api/auth/sign-out-all", null, undefined, { redirectOnUnauthenticated: false });
}

export function useSignOut({ onSuccess, everywhere = false }: { onSuccess?: () => void; everywhere?: boolean } = {}) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: everywhere ? signOutEverywhere : signOut,
    onSuccess: () => {
      const meKey = currentUserQueryOptions().queryKey;
      queryClient.removeQueries({ predicate: (query) => query.queryKey[0] !== meKey[0] });
      queryClient.setQueryData(meKey, null);
      onSuccess?.();
    },
  });
}
