import { QueryClient, type DefaultOptions } from "@tanstack/react-query";
import { ApiError } from "./api-client";

export const queryConfig = {
  queries: {
    refetchOnWindowFocus: false,
    staleTime: 60_000,
    // A 4xx will not change on retry; a network hiccup or a 5xx might.
    retry: (failureCount, error) => {
      if (error instanceof ApiError && error.status >= 400 && error.status < 500) return false;
      return failureCount < 2;
    },
  },
  mutations: { retry: false },
} satisfies DefaultOptions;

export function createQueryClient(): QueryClient {
  return new QueryClient({ defaultOptions: queryConfig });
}
