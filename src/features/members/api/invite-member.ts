import { useMutation, useQueryClient } from "@tanstack/react-query";
import type { InviteMemberInput } from "@shared/schemas/workshop";
import { authClient, unwrap } from "@/lib/auth-client";
import { getInvitationsQueryOptions } from "./get-invitations";

/** Sends the invitation; the server mails a link to /invite/:id through the mail module. */
export function inviteMember(workshopId: string, input: InviteMemberInput) {
  return unwrap(authClient.organization.inviteMember({ email: input.email, role: input.role, organizationId: workshopId }));
}

export function useInviteMember(workshopId: string) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (input: InviteMemberInput) => inviteMember(workshopId, input),
    onSuccess: async () => {
      await queryClient.invalidateQueries({ queryKey: getInvitationsQueryOptions(workshopId).queryKey });
      // A new mail sits in the outbox now.
      await queryClient.invalidateQueries({ queryKey: ["workshops", workshopId, "mail"] });
    },
  });
}
