import { useMutation, useQueryClient } from "@tanstack/react-query";
import { authClient, unwrap } from "@/lib/auth-client";
import { getMeQueryOptions } from "@/lib/auth";
import { getInvitationQueryOptions } from "./get-invitation";

/** Accepting makes the person a member; we also make the workshop active so the dashboard shows it. */
export async function acceptInvitation(invitationId: string) {
  const result = await unwrap(authClient.organization.acceptInvitation({ invitationId }));
  const organizationId = (result as { member?: { organizationId?: string } } | null)?.member?.organizationId;
  if (organizationId) await unwrap(authClient.organization.setActive({ organizationId }));
  return result;
}

export function useAcceptInvitation(invitationId: string) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: () => acceptInvitation(invitationId),
    onSuccess: async () => {
      await queryClient.fetchQuery({ ...getMeQueryOptions(), staleTime: 0 });
      // The page showing this invitation is about to be left: mark it stale without refetching now,
      // so the landing does not flip to "already accepted" under the person's cursor.
      await queryClient.invalidateQueries({ queryKey: getInvitationQueryOptions(invitationId).queryKey, refetchType: "none" });
      await queryClient.invalidateQueries({ predicate: (query) => !["me", "invitations"].includes(String(query.queryKey[0])) });
    },
  });
}
