import { useMutation, useQueryClient } from "@tanstack/react-query";
import { authClient, unwrap } from "@/lib/auth-client";
import { getMembersQueryOptions } from "./get-members";

export function removeMember(workshopId: string, memberId: string) {
  return unwrap(authClient.organization.removeMember({ memberIdOrEmail: memberId, organizationId: workshopId }));
}

export function useRemoveMember(workshopId: string) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (memberId: string) => removeMember(workshopId, memberId),
    onSuccess: () => queryClient.invalidateQueries({ queryKey: getMembersQueryOptions(workshopId).queryKey }),
  });
}
