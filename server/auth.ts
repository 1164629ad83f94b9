/**
 * Sign-in, sessions and workshops (better-auth). Workshops are better-auth organizations; the roles
 * and what they may do come from shared/permissions.ts, so the organization plugin, our route guards
 * and the client read one statement.
 */
import { betterAuth } from "better-auth";
import { drizzleAdapter } from "better-auth/adapters/drizzle";
import { APIError } from "better-auth/api";
import { and, asc, desc, eq, gt } from "drizzle-orm";
import { organization } from "better-auth/plugins";
import { ac, roles } from "../shared/permissions.ts";
import { passwordMaxLength, passwordMinLength } from "../shared/schemas/account.ts";
import { createAuthRules } from "./auth-rules.ts";
import type { Db } from "./db/client.ts";
import * as schema from "./db/schema.ts";
import type { Env } from "./env.ts";
import type { Logger } from "./logger.ts";
import { existingAccountMail, invitationMail, resetPasswordMail, verifyAddressMail } from "./mail/templates.ts";
import type { Mailer, OutgoingMail } from "./mail/mailer.ts";

export type AuthDeps = { db: Db; env: Env; mailer?: Mailer; logger?: Logger };

/** Where the address-confirmation link lands in the client when the form gave no place to go next. */
const CONFIRMED_PAGE = "/email-confirmed";

export function createAuth({ db, env, mailer, logger }: AuthDeps) {
  const rules = createAuthRules(db);
  /**
   * Account mail (confirmation, reset, "you already have an account") is sent without waiting, so the
   * answer takes the same time whether or not the address has an account. The mail row records the
   * outcome. With the in-process capture (no SMTP_URL) the link is also logged, for a local run.
   */
  const sendAccountMail = (mail: Omit<OutgoingMail, "workshopId" | "kind">, link: string) => {
    if (!mailer) return;
    if (!env.SMTP_URL) logger?.info({ to: mail.to, link }, "account mail captured in-process (no SMTP_URL); its link");
    void mailer.send({ ...mail, workshopId: null, kind: "other" }).catch((err) => logger?.error({ err }, "could not record an account mail"));
  };
  const confirmedPageFor = (email: string) => {
    const open = db
      .select({ id: schema.invitation.id })
      .from(schema.invitation)
      .where(and(eq(schema.invitation.email, email.toLowerCase()), eq(schema.invitation.status, "pending"), gt(schema.invitation.expiresAt, new Date())))
      .orderBy(desc(schema.invitation.createdAt))
      .get();
    return open ? `${CONFIRMED_PAGE}?next=${encodeURIComponent(`/invite/${open.id}`)}` : CONFIRMED_PAGE;
  };
  /** Ends every session of a user (removed from a workshop, role changed): their old cookies get 401 at once. */
  const endSessionsOf = (userId: string) => db.delete(schema.session).where(eq(schema.session.userId, userId)).run();

  return betterAuth({
    appName: "Tinelog",
    baseURL: env.baseUrl,
    basePath: "/api/auth",
    secret: env.secret,
    trustedOrigins: env.trustedOrigins,
    telemetry: { enabled: false },
    database: drizzleAdapter(db, { provider: "sqlite", schema }),
    emailAndPassword: {
      enabled: true,
      minPasswordLength: passwordMinLength,
      maxPasswordLength: passwordMaxLength,
      // A new account signs in only after its address is confirmed, and sign-up answers alike for a new
      // and an existing address (no account enumeration, OWASP ASVS V2.2/V3).
      requireEmailVerification: true,
      resetPasswordTokenExpiresIn: 60 * 60,
      revokeSessionsOnPasswordReset: true,
      async sendResetPassword({ user, url }) {
        sendAccountMail({ to: user.email, ...resetPasswordMail({ name: user.name, link: url }) }, url);
      },
      async onExistingUserSignUp({ user }) {
        const signInLink = `${env.baseUrl}/sign-in`;
        sendAccountMail({ to: user.email, ...existingAccountMail({ name: user.name, signInLink, resetLink: `${env.baseUrl}/forgot-password` }) }, signInLink);
      },
    },
    emailVerification: {
      sendOnSignUp: true,
      // An unconfirmed account that tries to sign in gets a fresh link (the old one may have expired).
      sendOnSignIn: true,
      autoSignInAfterVerification: true,
      expiresIn: 60 * 60 * 24,
      async sendVerificationEmail({ user, url }) {
        // better-auth sends the person to "/" when the form named no place (a sign-in before confirming
        // sends a fresh link that way). Ours is the confirmation page, and for someone invited it leads on
        // to the open invitation, so a resent link returns to it as the one from the sign-up form does.
        const link = url.replace(/callbackURL=%2F$/, `callbackURL=${encodeURIComponent(confirmedPageFor(user.email))}`);
        sendAccountMail({ to: user.email, ...verifyAddressMail({ name: user.name, link }) }, link);
      },
    },
    // No cookie cache: every request reads the session row, so a sign-out, a removal from a workshop or
    // a role change ends the session at once (the middleware's own short cache re-checks the row too).
    session: { expiresIn: 60 * 60 * 24 * 7, updateAge: 60 * 60 * 24, cookieCache: { enabled: false } },
    hooks: { before: rules.before, after: rules.after },
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
        // Sign-in counts failed attempts only (server/auth-rules.ts), not every request.
        "/sign-in/email": false,
        "/sign-up/email": { window: 60, max: 5 },
        "/request-password-reset": { window: 600, max: 5 },
        "/send-verification-email": { window: 600, max: 5 },
      },
    },
    plugins: [
      organization({
        ac,
        roles,
        creatorRole: "owner",
        invitationExpiresIn: 60 * 60 * 24 * 7,
        cancelPendingInvitationsOnReInvite: true,
        // Only a confirmed address may accept: otherwise whoever registered the address first could.
        requireEmailVerificationOnInvitation: true,
        organizationHooks: {
          async beforeCreateOrganization({ user }) {
            if (!user.emailVerified) throw new APIError("FORBIDDEN", { code: "EMAIL_NOT_VERIFIED", message: "Confirm your e-mail address first (open the link we sent you), then create the workshop." });
          },
          async afterRemoveMember({ user }) {
            endSessionsOf(user.id);
          },
          async afterUpdateMemberRole({ user, member, previousRole }) {
            if (String(member.role) !== String(previousRole)) endSessionsOf(user.id);
          },
        },
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
