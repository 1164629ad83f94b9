import { MutationCache, QueryCache, QueryClient } from "@tanstack/react-query";
import { isApiError } from "./api-client";

/** Same key as lib/auth.ts `meQueryKey`; spelled here to keep this module free of the auth client. */
const meKey = ["me"] as const;

export function createQueryClient(): QueryClient {
  // Any 401 means the session is gone (signed out elsewhere, expired): forget who we thought was
  // signed in, so loaders and the sign-in page do not trust a cached `me` and bounce back and forth.
  const forgetSessionOn401 = (error: unknown) => {
    if (isApiError(error) && error.status === 401) queryClient.setQueryData(meKey, null);
  };
  const queryClient: QueryClient = new QueryClient({
    queryCache: new QueryCache({ onError: forgetSessionOn401 }),
    mutationCache: new MutationCache({ onError: forgetSessionOn401 }),
    defaultOptions: {
      queries: {
        staleTime: 30_000,
        refetchOnWindowFocus: false,
        // A 4xx will not change by asking again; network hiccups and 5xx get one retry.
        retry: (failureCount, error) => {
          if (isApiError(error) && error.status >= 400 && error.status < 500) return false;
          return failureCount < 1;
        },
      },
      mutations: { retry: false },
    },
  });
  return queryClient;
}
