/**
 * Sign-in, sessions and workshops (better-auth). Workshops are better-auth organizations; the roles
 * and what they may do come from shared/permissions.ts, so the organization plugin, our route guards
 * and the client read one statement.
 */
import { betterAuth } from "better-auth";
import { drizzleAdapter } from "better-auth/adapters/drizzle";
import { asc, eq } from "drizzle-orm";
import { organization } from "better-auth/plugins";
import { ac, roles } from "../shared/permissions.ts";
import type { Db } from "./db/client.ts";
import * as schema from "./db/schema.ts";
import type { Env } from "./env.ts";
import { invitationMail } from "./mail/templates.ts";
import type { Mailer } from "./mail/mailer.ts";

export type AuthDeps = { db: Db; env: Env; mailer?: Mailer };

export function createAuth({ db, env, mailer }: AuthDeps) {
  return betterAuth({
    appName: "Tinelog",
    baseURL: env.baseUrl,
    basePath: "/api/auth",
    secret: env.secret,
    trustedOrigins: env.trustedOrigins,
    telemetry: { enabled: false },
    database: drizzleAdapter(db, { provider: "sqlite", schema }),
    emailAndPassword: { enabled: true, minPasswordLength: 10, autoSignIn: true },
    // cookieCache: the session is re-read from SQLite at most every 30 s, not on every poll of a bench
    // tablet; a sign-out or removal takes effect within that time.
    session: { expiresIn: 60 * 60 * 24 * 7, updateAge: 60 * 60 * 24, cookieCache: { enabled: true, maxAge: 30 } },
    databaseHooks: {
      session: {
        create: {
          // A new session starts in the workshop the user joined first, so every organization
          // endpoint and our routes agree on the active workshop from the first request.
          async before(session) {
            const first = db.select({ id: schema.member.organizationId }).from(schema.member).where(eq(schema.member.userId, session.userId)).orderBy(asc(schema.member.createdAt)).get();
            return { data: { ...session, activeOrganizationId: first?.id ?? null } };
          },
        },
      },
    },
    advanced: {
      // Secure cookies whenever the public address is https (behind a TLS proxy in production).
      useSecureCookies: env.baseUrl.startsWith("https://"),
      defaultCookieAttributes: { httpOnly: true, sameSite: "lax" },
    },
    // On in every mode (better-auth turns it off outside production by default), kept in SQLite so
    // that a restart or a second process does not reset the count.
    rateLimit: {
      enabled: true,
      storage: "database",
      window: 60,
      max: 200,
      customRules: {
        "/sign-in/email": { window: 60, max: 5 },
        "/sign-up/email": { window: 60, max: 5 },
      },
    },
    plugins: [
      organization({
        ac,
        roles,
        creatorRole: "owner",
        invitationExpiresIn: 60 * 60 * 24 * 7,
        cancelPendingInvitationsOnReInvite: true,
        async sendInvitationEmail(data) {
          if (!mailer) return;
          const link = `${env.baseUrl}/invite/${data.id}`;
          await mailer.send({
            workshopId: data.organization.id,
            kind: "invitation",
            relatedId: data.id,
            to: data.email,
            ...invitationMail({
              workshopName: data.organization.name,
              inviterName: data.inviter.user.name,
              role: data.role,
              link,
            }),
          });
        },
      }),
    ],
  });
}

export type Auth = ReturnType<typeof createAuth>;
