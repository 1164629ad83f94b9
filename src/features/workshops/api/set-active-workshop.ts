import { useMutation, useQueryClient } from "@tanstack/react-query";
import { authClient, unwrap } from "@/lib/auth-client";
import { getMeQueryOptions } from "@/lib/auth";

export function setActiveWorkshop(workshopId: string) {
  return unwrap(authClient.organization.setActive({ organizationId: workshopId }));
}

/**
 * Switching workshops changes the answer of every workshop-scoped query, so all of them are
 * invalidated; `me` is refetched first so the shell shows the new workshop and role at once.
 */
export function useSetActiveWorkshop() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: setActiveWorkshop,
    onSuccess: async () => {
      await queryClient.fetchQuery({ ...getMeQueryOptions(), staleTime: 0 });
      await queryClient.invalidateQueries({ predicate: (query) => query.queryKey[0] !== "me" });
    },
  });
}
