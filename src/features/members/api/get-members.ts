import { queryOptions, useQuery } from "@tanstack/react-query";
import type { RoleName } from "@shared/permissions";
import { authClient, unwrap } from "@/lib/auth-client";

export type Member = {
  id: string;
  userId: string;
  role: RoleName;
  createdAt: string | Date;
  user: { id: string; name: string; email: string };
};

export async function getMembers(workshopId: string): Promise<Member[]> {
  const result = await unwrap(authClient.organization.listMembers({ query: { organizationId: workshopId } }));
  return ((result?.members ?? []) as unknown as Member[]).slice().sort((a, b) => a.user.name.localeCompare(b.user.name));
}

export const getMembersQueryOptions = (workshopId: string) =>
  queryOptions({ queryKey: ["workshops", workshopId, "members"], queryFn: () => getMembers(workshopId) });

export function useMembers(workshopId: string) {
  return useQuery(getMembersQueryOptions(workshopId));
}
