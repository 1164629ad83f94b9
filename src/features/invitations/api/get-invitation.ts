import { queryOptions, useQuery } from "@tanstack/react-query";
import type { RoleName } from "@shared/permissions";
import { api } from "@/lib/api-client";

/**
 * What the public invitation landing may show before anyone signs in (GET /api/invitations/:id):
 * the workshop and the role, and only while the invitation is open (404 otherwise).
 */
export type PublicInvitation = {
  id: string;
  role: RoleName;
  workshopName: string;
};

/** The invitation, or `{ found: false }` (asked with ?notFound=ok, so an old link logs no error). */
export function getInvitation(id: string) {
  return api.get<PublicInvitation | { found: false }>(`/api/invitations/${encodeURIComponent(id)}?notFound=ok`);
}

export const invitationFound = (v: PublicInvitation | { found: false } | undefined): v is PublicInvitation => !!v && !("found" in v);

export const getInvitationQueryOptions = (id: string) => queryOptions({ queryKey: ["invitations", id], queryFn: () => getInvitation(id) });

export function useInvitation(id: string) {
  return useQuery(getInvitationQueryOptions(id));
}
