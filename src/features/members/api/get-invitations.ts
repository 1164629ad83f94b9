import { queryOptions, useQuery } from "@tanstack/react-query";
import type { RoleName } from "@shared/permissions";
import { authClient, unwrap } from "@/lib/auth-client";

export type Invitation = {
  id: string;
  email: string;
  role: RoleName;
  status: "pending" | "accepted" | "rejected" | "canceled";
  expiresAt: string | Date;
};

/** Pending invitations only: accepted ones show up as members, cancelled ones are history. */
export async function getPendingInvitations(workshopId: string): Promise<Invitation[]> {
  const all = (await unwrap(authClient.organization.listInvitations({ query: { organizationId: workshopId } }))) as unknown as Invitation[];
  const now = Date.now();
  return all.filter((invitation) => invitation.status === "pending" && new Date(invitation.expiresAt).getTime() > now);
}

export const getInvitationsQueryOptions = (workshopId: string) =>
  queryOptions({ queryKey: ["workshops", workshopId, "invitations"], queryFn: () => getPendingInvitations(workshopId) });

export function useInvitations(workshopId: string) {
  return useQuery(getInvitationsQueryOptions(workshopId));
}
