import { useMutation, useQueryClient } from "@tanstack/react-query";
import { authClient, unwrap } from "@/lib/auth-client";
import { getInvitationsQueryOptions } from "./get-invitations";

export function cancelInvitation(invitationId: string) {
  return unwrap(authClient.organization.cancelInvitation({ invitationId }));
}

export function useCancelInvitation(workshopId: string) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: cancelInvitation,
    onSuccess: () => queryClient.invalidateQueries({ queryKey: getInvitationsQueryOptions(workshopId).queryKey }),
  });
}
