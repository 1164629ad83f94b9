/**
 * Oversized input against the real server process: the sign-in library's routes included, a body
 * over the limit is refused with 413 before it is read (the test sends only its first bytes and
 * still gets the answer), the server keeps answering /api/health meanwhile, and the strings the
 * library stores are held to their limits (name ≤ 100 characters, e-mail ≤ 254 after RFC 5321).
 */
import { request as httpRequest } from "node:http";
import { mkdtempSync, rmSync } from "node:fs";
import { tmpdir } from "node:os";
import path from "node:path";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { signInCookie, spawnServer, type ServerProcess } from "../support/server-process.ts";

const TWO_MB = 2 * 1024 * 1024;
let server: ServerProcess;
let dataDir: string;

beforeAll(async () => {
  dataDir = mkdtempSync(path.join(tmpdir(), "tinelog-limits-"));
  server = await spawnServer({ dataDir, env: { SEED_DEMO: "1", DEMO_STRIKES: "0", ANALYSIS_THREADS: "1" } });
});
afterAll(async () => {
  await server?.kill("SIGTERM");
  rmSync(dataDir, { recursive: true, force: true });
});

/** A JSON body whose `name` makes it `bytes` long. */
function bigBody(bytes: number, extra: Record<string, string> = {}): Buffer {
  const head = JSON.stringify({ ...extra, name: "" }).slice(0, -2);
  return Buffer.from(`${head}"${"x".repeat(bytes - head.length - 3)}"}`);
}

/**
 * Sends the headers and only the first `sendBytes` of a body (declared or chunked), then waits for
 * the answer without ever finishing the body. A server that read the whole body first would never answer.
 */
function sendPartly(urlPath: string, opts: { body: Buffer; sendBytes: number; declareLength: boolean; cookie?: string }): Promise<{ status: number; body: string }> {
  const url = new URL(urlPath, server.baseUrl);
  return new Promise((resolve, reject) => {
    const req = httpRequest(
      url,
      {
        method: "POST",
        headers: {
          "Content-Type": "application/json",
          Origin: server.baseUrl,
          ...(opts.declareLength ? { "Content-Length": String(opts.body.length) } : { "Transfer-Encoding": "chunked" }),
          ...(opts.cookie ? { Cookie: opts.cookie } : {}),
        },
      },
      (res) => {
        let text = "";
        res.on("data", (c) => (text += c));
        res.on("end", () => resolve({ status: res.statusCode ?? 0, body: text }));
        res.on("error", reject);
      },
    );
    req.on("error", (error: NodeJS.ErrnoException) => {
      // The server may close the socket right after answering; the answer already arrived then.
      if (error.code !== "ECONNRESET" && error.code !== "EPIPE") reject(error);
    });
    for (let at = 0; at < opts.sendBytes; at += 1024) req.write(opts.body.subarray(at, Math.min(at + 1024, opts.sendBytes)));
    // Deliberately no req.end(): the rest of the body never comes.
    setTimeout(() => req.destroy(), 15_000).unref();
  });
}

async function health(): Promise<number> {
  return (await fetch(`${server.baseUrl}/api/health`)).status;
}

describe("a body over the limit", () => {
  it("refuses a declared 2 MB sign-up with 413 after its first 32 kB, without waiting for the rest", async () => {
    const res = await sendPartly("/api/auth/sign-up/email", { body: bigBody(TWO_MB, { email: "big@example.com", password: "long-enough-password" }), sendBytes: 32 * 1024, declareLength: true });
    expect(res.status).toBe(413);
    expect(JSON.parse(res.body).error.code).toBe("payload_too_large");
    expect(await health()).toBe(200);
  });

  it("refuses a chunked sign-up (no declared length) once it passes the limit, without waiting for the rest", async () => {
    const res = await sendPartly("/api/auth/sign-up/email", { body: bigBody(TWO_MB, { email: "big@example.com", password: "long-enough-password" }), sendBytes: 64 * 1024, declareLength: false });
    expect(res.status).toBe(413);
    expect(await health()).toBe(200);
  });

  it("refuses whole 2 MB sign-ups and update-user bodies with 413 while /api/health keeps answering; then a normal sign-in works", async () => {
    const cookie = await signInCookie(server.baseUrl, "maker@example.com", "tinelog-demo");
    const post = (url: string, body: Buffer, withCookie: boolean) =>
      fetch(`${server.baseUrl}${url}`, { method: "POST", headers: { "Content-Type": "application/json", Origin: server.baseUrl, ...(withCookie ? { Cookie: cookie } : {}) }, body: new Uint8Array(body), signal: AbortSignal.timeout(20_000) }).then((r) => r.status);
    const signUp = bigBody(TWO_MB, { email: "big@example.com", password: "long-enough-password" });
    const update = bigBody(TWO_MB);
    const [statuses, healths] = await Promise.all([
      Promise.all([...Array.from({ length: 4 }, () => post("/api/auth/sign-up/email", signUp, false)), ...Array.from({ length: 4 }, () => post("/api/auth/update-user", update, true))]),
      Promise.all(Array.from({ length: 8 }, () => health())),
    ]);
    expect(statuses).toEqual(Array(8).fill(413));
    expect(healths).toEqual(Array(8).fill(200));

    const again = await signInCookie(server.baseUrl, "maker@example.com", "tinelog-demo");
    const me = await (await fetch(`${server.baseUrl}/api/me`, { headers: { Cookie: again } })).json();
    expect(me.user.name).toBe("Ilse Varga"); // the oversized update changed nothing
  });

  it("refuses an update-user body over the limit for a signed-in user before reading it", async () => {
    const cookie = await signInCookie(server.baseUrl, "qa@example.com", "tinelog-demo");
    const res = await sendPartly("/api/auth/update-user", { body: bigBody(TWO_MB), sendBytes: 32 * 1024, declareLength: true, cookie });
    expect(res.status).toBe(413);
  });

  it("refuses an oversized JSON body on our own API too", async () => {
    const cookie = await signInCookie(server.baseUrl, "owner@example.com", "tinelog-demo");
    const res = await sendPartly("/api/workshop/profile", { body: bigBody(TWO_MB), sendBytes: 32 * 1024, declareLength: true, cookie });
    expect(res.status).toBe(413);
  });
});

describe("strings the sign-in library stores", () => {
  const post = async (url: string, body: unknown, cookie?: string) => {
    const r = await fetch(`${server.baseUrl}${url}`, { method: "POST", headers: { "Content-Type": "application/json", Origin: server.baseUrl, ...(cookie ? { Cookie: cookie } : {}) }, body: JSON.stringify(body) });
    return { status: r.status, body: await r.json() };
  };

  it("refuses a name over 100 characters at sign-up and in update-user with 400 and a field message", async () => {
    const signUp = await post("/api/auth/sign-up/email", { name: "n".repeat(101), email: "long.name@example.com", password: "long-enough-password" });
    expect(signUp.status).toBe(400);
    expect(signUp.body.fields.name).toMatch(/100 characters/);

    const cookie = await signInCookie(server.baseUrl, "maker@example.com", "tinelog-demo");
    const update = await post("/api/auth/update-user", { name: "n".repeat(101) }, cookie);
    expect(update.status).toBe(400);
    expect(update.body.fields.name).toMatch(/100 characters/);
    // 100 characters are fine.
    expect((await post("/api/auth/update-user", { name: "Ilse Varga" }, cookie)).status).toBe(200);
  });

  it("refuses an e-mail address over 254 characters (RFC 5321 §4.5.3.1.3) with 400 and a field message", async () => {
    const local = "a".repeat(64);
    const email = `${local}@${"d".repeat(63)}.${"e".repeat(63)}.${"f".repeat(63)}.example`; // 64 + 1 + 63·3 + 3 + 8 = 265
    const res = await post("/api/auth/sign-up/email", { name: "Long Address", email, password: "long-enough-password" });
    expect(res.status).toBe(400);
    expect(res.body.fields.email).toMatch(/254/);
  });
});
