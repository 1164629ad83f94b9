import { useMutation, useQueryClient } from "@tanstack/react-query";
import type { RoleName } from "@shared/permissions";
import { authClient, unwrap } from "@/lib/auth-client";
import { getMeQueryOptions } from "@/lib/auth";
import { getMembersQueryOptions } from "./get-members";

export function updateMemberRole(workshopId: string, memberId: string, role: RoleName) {
  return unwrap(authClient.organization.updateMemberRole({ memberId, role, organizationId: workshopId }));
}

export function useUpdateMemberRole(workshopId: string) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: ({ memberId, role }: { memberId: string; role: RoleName }) => updateMemberRole(workshopId, memberId, role),
    onSuccess: async () => {
      await queryClient.invalidateQueries({ queryKey: getMembersQueryOptions(workshopId).queryKey });
      // The owner may have changed their own role.
      await queryClient.invalidateQueries({ queryKey: getMeQueryOptions().queryKey });
    },
  });
}
