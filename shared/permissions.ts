/**
 * What each workshop role may do. One statement, used three ways:
 * better-auth's organization plugin enforces it on its own endpoints, the server's route guards
 * (`requirePermission`) check it on ours, and the client hides what a role may not use.
 */
import { createAccessControl } from "better-auth/plugins/access";
import { defaultStatements } from "better-auth/plugins/organization/access";

export const statement = {
  ...defaultStatements,
  workshop: ["read", "update"],
  /** "read": every mail of the workshop; "read-certificates": the certificate mails only. */
  mail: ["read", "read-certificates"],
  spec: ["read", "write"],
  batch: ["read", "create", "release"],
  unit: ["read", "create"],
  /** "void": take one's own strike out of the record; "void-others": anyone's. */
  strike: ["read", "create", "void", "void-others"],
  disposition: ["create", "supersede"],
  certificate: ["read", "issue", "withdraw"],
  audit: ["read"],
  instrument: ["read", "write"],
  evaluation: ["create"],
} as const;

export const ac = createAccessControl(statement);

type Grants = { [K in keyof typeof statement]?: readonly (typeof statement)[K][number][] };

const makerGrants = {
  workshop: ["read"],
  spec: ["read"],
  batch: ["read", "create"],
  unit: ["read", "create"],
  strike: ["read", "create", "void"],
  certificate: ["read"],
  instrument: ["read"],
} satisfies Grants;

const qaGrants = {
  ...makerGrants,
  spec: ["read", "write"],
  batch: ["read", "create", "release"],
  strike: ["read", "create", "void", "void-others"],
  disposition: ["create", "supersede"],
  certificate: ["read", "issue", "withdraw"],
  mail: ["read-certificates"],
  audit: ["read"],
  instrument: ["read", "write"],
  evaluation: ["create"],
} satisfies Grants;

const ownerGrants = {
  ...qaGrants,
  workshop: ["read", "update"],
  mail: ["read", "read-certificates"],
  // No "delete": a workshop holds a quality record that must be kept.
  organization: ["update"],
  member: ["create", "update", "delete"],
  invitation: ["create", "cancel"],
  ac: ["read"],
} satisfies Grants;

export const grants = { owner: ownerGrants, qa: qaGrants, maker: makerGrants } as const;

export const roles = {
  owner: ac.newRole(ownerGrants as never),
  qa: ac.newRole(qaGrants as never),
  maker: ac.newRole(makerGrants as never),
};

export const roleNames = ["owner", "qa", "maker"] as const;
export type RoleName = (typeof roleNames)[number];
export type Resource = keyof typeof statement;
export type Action<R extends Resource> = (typeof statement)[R][number];

/** True when `role` may perform `action` on `resource`. Pure; safe on both sides. */
export function can<R extends Resource>(role: RoleName | null | undefined, resource: R, action: Action<R>): boolean {
  if (!role) return false;
  const list = (grants[role] as Grants)[resource] as readonly string[] | undefined;
  return list?.includes(action) ?? false;
}

export const roleLabels: Record<RoleName, string> = {
  owner: "Owner",
  qa: "Quality",
  maker: "Maker",
};
