/**
 * Sessions that end, and the workshop endpoints of the sign-in library held to Tinelog's rules:
 * after sign-out, removal from a workshop or a change of role the old cookies get 401 at once on
 * every route; a maker or QA cannot remove an owner (403); another workshop's id is 404 and changes
 * nothing; the public invitation look-up shows only the workshop's name and the role, while open.
 */
import { and, eq } from "drizzle-orm";
import request from "supertest";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { invitation, member, organization, user } from "../../server/db/schema.ts";
import { ORIGIN, startTestApp, type TestApp } from "../support/app.ts";

let t: TestApp;
beforeAll(async () => {
  t = await startTestApp({ DEMO_STRIKES: "0" });
});
afterAll(async () => t.close());

/** Signs in on a fresh connection and returns the cookie header, as a browser would keep it. */
async function cookieOf(email: string, password = "tinelog-demo"): Promise<string> {
  const res = await request(t.app).post("/api/auth/sign-in/email").set("Origin", ORIGIN).send({ email, password });
  expect(res.status, JSON.stringify(res.body)).toBe(200);
  return ([] as string[]).concat(res.headers["set-cookie"] ?? []).map((c) => c.split(";")[0]).join("; ");
}

const get = (url: string, cookie: string) => request(t.app).get(url).set("Cookie", cookie);
const post = (url: string, cookie: string, body: object = {}) => request(t.app).post(url).set("Origin", ORIGIN).set("Cookie", cookie).send(body);

/** The statuses of a read, a write and a sign-in library call made with `cookie`. */
async function statusesWith(cookie: string) {
  return [
    // /api/me answers a signed-out browser with 200 and `user: null` (nobody is signed in is an answer, not
    // an error), so its entry here is 200 only while the cookie still names a person, 401 once it does not.
    (await get("/api/me", cookie)).body.user ? 200 : 401,
    (await get("/api/batches", cookie)).status,
    (await post("/api/batches", cookie, {})).status,
    (await get("/api/auth/organization/list", cookie)).status,
  ];
}

function demoWorkshopId(): string {
  return t.runtime.db.select().from(organization).where(eq(organization.slug, "brightwater")).get()!.id;
}
function memberIdOf(email: string): string {
  const u = t.runtime.db.select().from(user).where(eq(user.email, email)).get()!;
  return t.runtime.db.select().from(member).where(and(eq(member.userId, u.id), eq(member.organizationId, demoWorkshopId()))).get()!.id;
}

describe("workshop endpoints of the sign-in library", () => {
  it("answers a maker or QA who tries to remove an owner with 403, and the owner stays", async () => {
    for (const who of ["maker@example.com", "qa@example.com"]) {
      const res = await post("/api/auth/organization/remove-member", await cookieOf(who), { memberIdOrEmail: memberIdOf("owner@example.com"), organizationId: demoWorkshopId() });
      expect(res.status, `${who}: ${JSON.stringify(res.body)}`).toBe(403);
    }
    expect(memberIdOf("owner@example.com")).toBeTruthy();
  });

  it("answers a maker who tries to change a role with 403", async () => {
    const res = await post("/api/auth/organization/update-member-role", await cookieOf("maker@example.com"), { memberId: memberIdOf("qa@example.com"), role: "owner", organizationId: demoWorkshopId() });
    expect(res.status).toBe(403);
  });

  it("answers a switch to another workshop's id with 404 and leaves the active workshop as it was", async () => {
    const cookie = await cookieOf("maker@example.com");
    const before = (await get("/api/me", cookie)).body.activeWorkshop.id;
    const other = t.runtime.db.select().from(organization).where(eq(organization.slug, "fernhollow")).get()!.id;
    const res = await post("/api/auth/organization/set-active", cookie, { organizationId: other });
    expect(res.status).toBe(404);
    expect((await get("/api/me", cookie)).body.activeWorkshop.id).toBe(before);
    expect((await post("/api/auth/organization/set-active", cookie, { organizationSlug: "fernhollow" })).status).toBe(404);
    expect((await get("/api/batches", cookie)).status).toBe(200);
  });
});

describe("the public invitation look-up", () => {
  async function invite(email: string): Promise<string> {
    const res = await post("/api/auth/organization/invite-member", await cookieOf("owner@example.com"), { email, role: "maker" });
    expect(res.status, JSON.stringify(res.body)).toBe(200);
    return res.body.id;
  }

  it("shows only the workshop's name and the role while the invitation is open", async () => {
    const id = await invite("lookup@example.com");
    const res = await request(t.app).get(`/api/invitations/${id}`);
    expect(res.status).toBe(200);
    expect(res.body).toEqual({ id, workshopName: "Brightwater Tuning Works", role: "maker" });
  });

  it("shows nothing once the invitation is cancelled, accepted or expired", async () => {
    const cancelled = await invite("cancelled@example.com");
    expect((await post("/api/auth/organization/cancel-invitation", await cookieOf("owner@example.com"), { invitationId: cancelled })).status).toBe(200);
    expect((await request(t.app).get(`/api/invitations/${cancelled}`)).status).toBe(404);

    const expired = await invite("expired@example.com");
    t.runtime.db.update(invitation).set({ expiresAt: new Date(Date.now() - 1000) }).where(eq(invitation.id, expired)).run();
    expect((await request(t.app).get(`/api/invitations/${expired}`)).status).toBe(404);

    // Accepted by a confirmed account of that address.
    const accepted = await invite("joiner@example.com");
    const authContext = await t.runtime.auth.$context;
    const created = await authContext.internalAdapter.createUser({ email: "joiner@example.com", name: "Joiner", emailVerified: true }, { method: "email-password" });
    await authContext.internalAdapter.linkAccount({ userId: created.id, providerId: "credential", accountId: created.id, password: await authContext.password.hash("joiner-password-1") });
    const joined = await post("/api/auth/organization/accept-invitation", await cookieOf("joiner@example.com", "joiner-password-1"), { invitationId: accepted });
    expect(joined.status, JSON.stringify(joined.body)).toBe(200);
    expect((await request(t.app).get(`/api/invitations/${accepted}`)).status).toBe(404);
  });
});

describe("sessions end at once", () => {
  it("after sign-out, the old cookies get 401 on our routes and the library's", async () => {
    const cookie = await cookieOf("maker@example.com");
    expect(await statusesWith(cookie)).toEqual([200, 200, 400, 200]);
    expect((await post("/api/auth/sign-out", cookie)).status).toBe(200);
    expect(await statusesWith(cookie)).toEqual([401, 401, 401, 401]);
  });

  it("after removal from the workshop, the removed member's cookies get 401", async () => {
    const cookie = await cookieOf("qa@example.com");
    expect((await get("/api/batches", cookie)).status).toBe(200); // read once, so it sits in the middleware's cache
    const res = await post("/api/auth/organization/remove-member", await cookieOf("owner@example.com"), { memberIdOrEmail: memberIdOf("qa@example.com"), organizationId: demoWorkshopId() });
    expect(res.status, JSON.stringify(res.body)).toBe(200);
    expect(await statusesWith(cookie)).toEqual([401, 401, 401, 401]);
  });

  it("after a change of role, the member's old cookies get 401; a fresh sign-in carries the new role", async () => {
    const cookie = await cookieOf("maker@example.com");
    expect((await get("/api/me", cookie)).body.activeWorkshop.role).toBe("maker");
    const res = await post("/api/auth/organization/update-member-role", await cookieOf("owner@example.com"), { memberId: memberIdOf("maker@example.com"), role: "qa", organizationId: demoWorkshopId() });
    expect(res.status, JSON.stringify(res.body)).toBe(200);
    expect(await statusesWith(cookie)).toEqual([401, 401, 401, 401]);
    expect((await get("/api/me", await cookieOf("maker@example.com"))).body.activeWorkshop.role).toBe("qa");
  });
});
