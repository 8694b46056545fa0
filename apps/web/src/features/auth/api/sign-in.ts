import { currentUserSchema, signInInput, type CurrentUser, type SignInInput } from "@tributary/contracts";
import { useMutation, useQueryClient } from "@tanstack/react-query";
import { api } from "../../../lib/api-client";
import { currentUserQueryOptions } from "./get-current-user";

export { signInInput, type SignInInput };

export function signIn(input: SignInInput): Promise<CurrentUser> {
  return api.post("/api/auth/sign-in", currentUserSchema, input, { redirectOnUnauthenticated: false });
}

export function useSignIn({ onSuccess }: { onSuccess?: (user: CurrentUser) => void } = {}) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: signIn,
    onSuccess: (user) => {
      // Nothing cached for a previous user may leak into this session.
      queryClient.removeQueries();
      queryClient.setQueryData(currentUserQueryOptions().queryKey, user);
      onSuccess?.(user);
    },
  });
}
