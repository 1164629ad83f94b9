/**
 * Resolves the session (better-auth) and the active workshop with the member's role, once per request.
 * Handlers read `req.ctx`; they never look at cookies or role names themselves.
 */
import { fromNodeHeaders } from "better-auth/node";
import { and, asc, eq, sql } from "drizzle-orm";
import type { NextFunction, Request, Response } from "express";
import type { RoleName } from "../../shared/permissions.ts";
import type { Auth } from "../auth.ts";
import type { Db } from "../db/client.ts";
import { member, organization, session as sessionTable } from "../db/schema.ts";

export type Workshop = { id: string; name: string; slug: string; role: RoleName };

export type RequestContext = {
  user: { id: string; name: string; email: string } | null;
  sessionId: string | null;
  workshop: Workshop | null;
};

declare global {
  // eslint-disable-next-line @typescript-eslint/no-namespace
  namespace Express {
    interface Request {
      ctx: RequestContext;
    }
  }
}

export function listWorkshops(db: Db, userId: string): Workshop[] {
  return db
    .select({ id: organization.id, name: organization.name, slug: organization.slug, role: member.role })
    .from(member)
    .innerJoin(organization, eq(organization.id, member.organizationId))
    .where(eq(member.userId, userId))
    .orderBy(asc(member.createdAt))
    .all()
    .map((w) => ({ ...w, slug: w.slug ?? w.id, role: w.role as RoleName }));
}

type Found = Awaited<ReturnType<Auth["api"]["getSession"]>>;

/** The session cookie's value, whichever name better-auth gave it (`__Secure-` behind https). */
export function sessionToken(cookieHeader: string | undefined): string | null {
  const m = /(?:^|;\s*)(?:__Secure-)?better-auth\.session_token=([^;]+)/.exec(cookieHeader ?? "");
  return m ? m[1] : null;
}

/** The session row's token: the part of the signed cookie value before its signature. */
function rowToken(cookieValue: string): string {
  let value = cookieValue;
  try {
    value = decodeURIComponent(cookieValue);
  } catch {
    // not URL-encoded
  }
  return value.split(".")[0];
}

/**
 * better-auth's getSession costs about a millisecond; a bench tablet polls every second. Sessions are
 * kept here for a few seconds per token; any request to /api/auth/* with that token (sign-out,
 * switching workshop) forgets it at once, and every use checks that the session row still exists
 * (an indexed look-up of a few microseconds), so a session ended anywhere (sign-out on another tab,
 * removal from a workshop, a password reset) is refused on the next request. Roles are always read fresh below.
 */
export function createSessionCache(ttlMs = 5000, max = 5000) {
  const entries = new Map<string, { found: Found; at: number }>();
  return {
    get(token: string): Found | undefined {
      const e = entries.get(token);
      if (!e) return undefined;
      if (Date.now() - e.at > ttlMs) {
        entries.delete(token);
        return undefined;
      }
      return e.found;
    },
    set(token: string, found: Found) {
      entries.set(token, { found, at: Date.now() });
      if (entries.size > max) entries.delete(entries.keys().next().value!);
    },
    forget(token: string | null) {
      if (token) entries.delete(token);
    },
  };
}
export type SessionCache = ReturnType<typeof createSessionCache>;

export function contextMiddleware(auth: Auth, db: Db, cache: SessionCache) {
  const live = db
    .select({ id: sessionTable.id })
    .from(sessionTable)
    .where(and(eq(sessionTable.token, sql.placeholder("token")), sql`${sessionTable.expiresAt} > ${sql.placeholder("now")}`))
    .prepare();
  return async (req: Request, _res: Response, next: NextFunction) => {
    req.ctx = { user: null, sessionId: null, workshop: null };
    try {
      const token = sessionToken(req.headers.cookie);
      if (!token) return next();
      let found = cache.get(token);
      if (found && !live.get({ token: rowToken(token), now: Date.now() })) {
        cache.forget(token);
        return next();
      }
      if (found === undefined) {
        found = await auth.api.getSession({ headers: fromNodeHeaders(req.headers) });
        if (found) cache.set(token, found);
      }
      if (!found) return next();
      const { user, session } = found;
      req.ctx.user = { id: user.id, name: user.name, email: user.email };
      req.ctx.sessionId = session.id;
      const activeId = (session as { activeOrganizationId?: string | null }).activeOrganizationId;
      if (activeId) {
        const row = db
          .select({ id: organization.id, name: organization.name, slug: organization.slug, role: member.role })
          .from(member)
          .innerJoin(organization, eq(organization.id, member.organizationId))
          .where(and(eq(member.userId, user.id), eq(member.organizationId, activeId)))
          .get();
        if (row) req.ctx.workshop = { ...row, slug: row.slug ?? row.id, role: row.role as RoleName };
      }
      // No active workshop chosen yet (a fresh sign-in): the first one the user joined.
      req.ctx.workshop ??= listWorkshops(db, user.id)[0] ?? null;
      next();
    } catch (error) {
      next(error);
    }
  };
}
