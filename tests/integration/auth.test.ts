/**
 * Sign-in, errors and the security shell, through the real app: wrong password, rate limiting kept
 * in SQLite, the JSON error shape, Origin and content-type checks, headers and cookie flags.
 */
import request from "supertest";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { ORIGIN, startTestApp, type TestApp } from "../support/app.ts";

let t: TestApp;
beforeAll(async () => {
  t = await startTestApp({ DEMO_STRIKES: "0" });
});
afterAll(async () => t.close());

const signIn = (ip: string, password: string) =>
  request(t.app).post("/api/auth/sign-in/email").set("Origin", ORIGIN).set("X-Forwarded-For", ip).send({ email: "maker@example.com", password });

describe("sign-in", () => {
  it("answers a wrong password with 401 and a plain message", async () => {
    const res = await signIn("10.0.0.1", "wrong-password");
    expect(res.status).toBe(401);
    expect(res.body.message ?? res.body.error?.message).toMatch(/invalid email or password/i);
  });

  it("limits repeated failed attempts from one address with 429, stored in the database", async () => {
    const statuses: number[] = [];
    for (let i = 0; i < 7; i++) statuses.push((await signIn("10.0.0.2", "wrong-password")).status);
    expect(statuses.slice(0, 5).every((s) => s === 401)).toBe(true);
    expect(statuses.at(-1)).toBe(429);
    // Locked means locked: the right password from that address waits out the window too.
    expect((await signIn("10.0.0.2", "tinelog-demo")).status).toBe(429);
    const rows = t.runtime.sqlite.prepare("SELECT count(*) AS n FROM sign_in_failure").get() as { n: number };
    expect(rows.n).toBeGreaterThan(0);
    // Another address is not affected.
    expect((await signIn("10.0.0.3", "tinelog-demo")).status).toBe(200);
  });

  it("counts failed attempts only: a shared bench computer signing in correctly again and again is never locked out", async () => {
    const statuses: number[] = [];
    for (let i = 0; i < 8; i++) statuses.push((await signIn("10.0.0.5", "tinelog-demo")).status);
    expect(statuses).toEqual(Array(8).fill(200));
    // A colleague's one typo on the same computer still gets the plain 401, not a lock.
    expect((await signIn("10.0.0.5", "wrong-password")).status).toBe(401);
    expect((await signIn("10.0.0.5", "tinelog-demo")).status).toBe(200);
  });

  it("sets the session cookie HttpOnly and SameSite", async () => {
    const res = await signIn("10.0.0.4", "tinelog-demo");
    const cookie = ([] as string[]).concat(res.headers["set-cookie"] ?? []).find((c) => c.includes("session_token"));
    expect(cookie).toMatch(/HttpOnly/i);
    expect(cookie).toMatch(/SameSite=Lax/i);
    expect(cookie).not.toMatch(/Secure/); // http base URL; Secure is set behind https (see env test)
  });
});

describe("error shape and request checks", () => {
  it("gives a JSON 404 for an unknown API route", async () => {
    const res = await request(t.app).get("/api/no-such-thing");
    expect(res.status).toBe(404);
    expect(res.body.error).toEqual({ code: "not_found", message: expect.stringContaining("/no-such-thing") });
  });

  it("names each invalid field with a 400", async () => {
    const qa = await t.as("qa");
    const res = await qa.post("/api/specs").set("Origin", ORIGIN).send({ name: "", family: "spoon", partials: [] });
    expect(res.status).toBe(400);
    expect(res.body.error.code).toBe("validation_failed");
    expect(Object.keys(res.body.error.fields)).toEqual(expect.arrayContaining(["name", "family", "partials"]));
  });

  it("rejects malformed JSON with a 400 that says so", async () => {
    const qa = await t.as("qa");
    const res = await qa.post("/api/specs").set("Origin", ORIGIN).set("Content-Type", "application/json").send('{"name": ');
    expect(res.status).toBe(400);
    expect(res.body.error.message).toMatch(/not valid JSON/);
  });

  it("rejects a state-changing request from a foreign Origin, or with no Origin", async () => {
    const qa = await t.as("qa");
    expect((await qa.post("/api/specs").set("Origin", "https://evil.example").send({})).status).toBe(403);
    expect((await qa.post("/api/specs").send({})).status).toBe(403);
  });

  it("rejects a non-JSON body on a JSON route with 415", async () => {
    const qa = await t.as("qa");
    const res = await qa.post("/api/specs").set("Origin", ORIGIN).set("Content-Type", "text/plain").send("name=x");
    expect(res.status).toBe(415);
  });

  it("sends security headers (helmet)", async () => {
    const res = await request(t.app).get("/api/health");
    expect(res.headers["x-content-type-options"]).toBe("nosniff");
    expect(res.headers["content-security-policy"]).toContain("default-src 'self'");
    expect(res.headers["x-powered-by"]).toBeUndefined();
  });
});

describe("the local demo (npm start)", () => {
  it("refuses a page on the development server's origin (localhost:5173) moving a batch with the owner's cookies", async () => {
    const demo = await startTestApp({ DEMO_STRIKES: "0", NODE_ENV: "production", BASE_URL: "http://localhost:3999" });
    try {
      const signedIn = await request(demo.app).post("/api/auth/sign-in/email").set("Origin", "http://localhost:3999").send({ email: "owner@example.com", password: "tinelog-demo" });
      const cookie = ([] as string[]).concat(signedIn.headers["set-cookie"] ?? []).map((c) => c.split(";")[0]).join("; ");
      const batches = (await request(demo.app).get("/api/batches").set("Cookie", cookie)).body.batches as { id: string; code: string }[];
      const open = batches.find((b) => b.code === "BTW-2612")!;
      const res = await request(demo.app).post(`/api/batches/${open.id}/review`).set("Cookie", cookie).set("Origin", "http://localhost:5173").send({});
      expect(res.status).toBe(403);
      expect(batches.find((b) => b.code === "BTW-2612")).toBeTruthy();
      expect((await request(demo.app).get(`/api/batches/${open.id}`).set("Cookie", cookie)).body.state).toBe("open");
    } finally {
      await demo.close();
    }
  });
});

describe("behind https", () => {
  it("marks the session cookie Secure and sends HSTS when the base URL is https", async () => {
    const secure = await startTestApp({ DEMO_STRIKES: "0", BASE_URL: "https://tinelog.example" });
    try {
      const res = await request(secure.app).post("/api/auth/sign-in/email").set("Origin", "https://tinelog.example").send({ email: "maker@example.com", password: "tinelog-demo" });
      expect(res.status).toBe(200);
      const cookie = ([] as string[]).concat(res.headers["set-cookie"] ?? []).find((c) => c.includes("session_token"));
      expect(cookie).toMatch(/; Secure/i);
      expect((await request(secure.app).get("/api/health")).headers["strict-transport-security"]).toMatch(/max-age=/);
    } finally {
      await secure.close();
    }
  });
});
