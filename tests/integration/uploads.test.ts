/**
 * Uploads are checked from the bytes and bounded, and a refused upload leaves nothing behind:
 * the size limit holds mid-stream (no Content-Length), the quota and a nearly full disk give clear
 * 413/507 answers, the RIFF/WAVE header decides (not the name or Content-Type), format bounds give 422.
 */
import http from "node:http";
import { readdirSync } from "node:fs";
import { eq } from "drizzle-orm";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { batch, strike, unit } from "../../server/db/schema.ts";
import { synthStrikeWav } from "../../seeds/synth.ts";
import { ORIGIN, startTestApp, type TestApp } from "../support/app.ts";
import { forkWav } from "../support/wav.ts";

let t: TestApp;
let unitId = "";
beforeAll(async () => {
  t = await startTestApp({ DEMO_STRIKES: "0", UPLOAD_LIMIT_MB: "1", WORKSHOP_QUOTA_MB: "2" });
  const open = t.runtime.db.select().from(batch).where(eq(batch.code, "BTW-2612")).get()!;
  unitId = t.runtime.db.select().from(unit).where(eq(unit.batchId, open.id)).all()[0].id;
});
afterAll(async () => t.close());

const nothingLeft = () => expect(readdirSync(t.runtime.storage.incoming)).toEqual([]);
const upload = async (bytes: Uint8Array, name: string, type = "audio/wav") =>
  (await t.as("maker")).post(`/api/units/${unitId}/strikes`).set("Origin", ORIGIN).attach("audio", Buffer.from(bytes), { filename: name, contentType: type });

describe("upload checks", () => {
  it("stops a chunked upload at the size limit mid-stream with 413", async () => {
    const agent = await t.as("maker");
    // Borrow the agent's session cookie for a raw chunked request (no Content-Length to pre-check).
    const me = await agent.get("/api/me");
    const cookie = (me.request as unknown as { cookies: string }).cookies;
    const server = t.app.listen(0);
    const port = (server.address() as { port: number }).port;
    try {
      const status = await new Promise<number>((resolve, reject) => {
        const boundary = "tinelogboundary";
        const req = http.request({ host: "127.0.0.1", port, method: "POST", path: `/api/units/${unitId}/strikes`, headers: { Cookie: cookie, Origin: ORIGIN, "Content-Type": `multipart/form-data; boundary=${boundary}`, "Transfer-Encoding": "chunked" } }, (res) => {
          res.resume();
          resolve(res.statusCode ?? 0);
        });
        req.on("error", (e) => (String(e).includes("EPIPE") || String(e).includes("ECONNRESET") ? undefined : reject(e)));
        req.write(`--${boundary}\r\nContent-Disposition: form-data; name="audio"; filename="huge.wav"\r\nContent-Type: audio/wav\r\n\r\n`);
        const chunk = Buffer.alloc(64 * 1024, 1);
        let sent = 0;
        const pump = () => {
          while (sent < 3 * 1024 * 1024) {
            sent += chunk.length;
            if (!req.write(chunk)) return req.once("drain", pump);
          }
          req.end(`\r\n--${boundary}--\r\n`);
        };
        pump();
      });
      expect(status).toBe(413);
    } finally {
      server.close();
    }
    nothingLeft();
  });

  it("decides by the bytes: a WAV with a wrong name and Content-Type is accepted, text named .wav is not", async () => {
    expect((await upload(forkWav({ frequencyHz: 440, seed: 1, durationS: 1 }), "recording.txt", "text/plain")).status).toBe(202);
    const text = await upload(new TextEncoder().encode("RIFF? no, just notes about the fork"), "fork.wav");
    expect(text.status).toBe(415);
    expect(text.body.error.message).toMatch(/not a WAV/i);
    nothingLeft();
  });

  it("refuses a sample rate outside the bounds with 422", async () => {
    const low = synthStrikeWav({ sampleRate: 4000, durationS: 1, seed: 2, partials: [{ frequencyHz: 440, amplitude: 0.3, tauS: 1 }] });
    const res = await upload(low, "low-rate.wav");
    expect(res.status).toBe(422);
    expect(res.body.error.message).toMatch(/4000 Hz.*8000/);
    nothingLeft();
  });

  it("answers 413 with the quota when the workshop's storage is used up", async () => {
    // Quota 2 MB: fill it with ~0.9 MB strikes until the next one would not fit.
    let last = 0;
    for (let i = 0; i < 4; i++) {
      const res = await upload(forkWav({ frequencyHz: 441 + i, durationS: 9, seed: 30 + i }), `q-${i}.wav`);
      last = res.status;
      if (res.status === 413) {
        expect(res.body.error.message).toMatch(/storage quota \(2 MB\)/);
        break;
      }
    }
    expect(last).toBe(413);
    nothingLeft();
  });

  it("answers 507 and stores nothing when the disk is nearly full", async () => {
    const tight = await startTestApp({ DEMO_STRIKES: "0", MIN_FREE_DISK_MB: String(1024 * 1024 * 1024) }); // "keep 1 PB free"
    try {
      const open = tight.runtime.db.select().from(batch).where(eq(batch.code, "BTW-2612")).get()!;
      const u = tight.runtime.db.select().from(unit).where(eq(unit.batchId, open.id)).all()[0];
      const res = await (await tight.as("maker")).post(`/api/units/${u.id}/strikes`).set("Origin", ORIGIN).attach("audio", Buffer.from(forkWav({ frequencyHz: 440, seed: 5 })), "x.wav");
      expect(res.status).toBe(507);
      expect(res.body.error.message).toMatch(/disk is nearly full/);
      expect(tight.runtime.db.select().from(strike).all()).toEqual([]);
      expect(readdirSync(tight.runtime.storage.incoming)).toEqual([]);
    } finally {
      await tight.close();
    }
  });
});

describe("a full analysis queue", () => {
  it("answers 503 busy and stores nothing when too many recordings wait", async () => {
    const busy = await startTestApp({ DEMO_STRIKES: "1", ANALYSIS_QUEUE: "1" });
    try {
      // The demo seed has just queued ten strikes; stop the runner so they stay waiting (over the bound of 1).
      await busy.runtime.queue.close();
      const open = busy.runtime.db.select().from(batch).where(eq(batch.code, "BTW-2612")).get()!;
      const u = busy.runtime.db.select().from(unit).where(eq(unit.batchId, open.id)).all()[0];
      const before = busy.runtime.db.select().from(strike).all().length;
      const res = await (await busy.as("maker")).post(`/api/units/${u.id}/strikes`).set("Origin", ORIGIN).attach("audio", Buffer.from(forkWav({ frequencyHz: 440, seed: 8 })), "wait.wav");
      expect(res.status).toBe(503);
      expect(res.body.error).toMatchObject({ code: "busy", message: expect.stringMatching(/queue is full/) });
      expect(busy.runtime.db.select().from(strike).all().length).toBe(before);
    } finally {
      await busy.close();
    }
  });
});
