import { queryOptions, useQuery } from "@tanstack/react-query";
import type { RoleName } from "@shared/permissions";
import type { WorkshopProfileInput } from "@shared/schemas/workshop";
import { api } from "@/lib/api-client";

export type WorkshopProfile = WorkshopProfileInput;
export type Workshop = { id: string; name: string; slug: string; role: RoleName; profile: WorkshopProfile };

export function getWorkshop(): Promise<Workshop> {
  return api.get<Workshop>("/api/workshop");
}

export const getWorkshopQueryOptions = (workshopId: string) => queryOptions({ queryKey: ["workshops", workshopId, "profile"], queryFn: getWorkshop });

export function useWorkshop(workshopId: string) {
  return useQuery(getWorkshopQueryOptions(workshopId));
}

/** Certificates print the address and are sent from these addresses, so all must be there. */
export function profileGaps(profile: WorkshopProfile): string[] {
  const gaps: string[] = [];
  if (!profile.address.trim()) gaps.push("postal address");
  if (!profile.sendingEmail.trim()) gaps.push("sending e-mail");
  if (!profile.qualityEmail.trim()) gaps.push("quality e-mail");
  return gaps;
}
