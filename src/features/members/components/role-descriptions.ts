import type { RoleName } from "@shared/permissions";

/** What each role may do, in plain words; the grants themselves live in shared/permissions.ts. */
export const roleDescriptions: Record<RoleName, string> = {
  owner: "Everything, including members, invitations and the outbox.",
  qa: "Specifications, dispositions, batch release and certificates.",
  maker: "Batches, units and strikes; reads results.",
};
