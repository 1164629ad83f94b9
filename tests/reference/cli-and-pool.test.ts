/**
 * The CLI contract (`npm run -s analyze -- --json FILE...`, one JSON result per file) and the worker pool,
 * run as the server and a maker's shell would: a real child process and real worker threads.
 */
import { execFile } from "node:child_process";
import { mkdtempSync, rmSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { promisify } from "node:util";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { analysisResultSchema } from "../../shared/schemas/analysis";
import { fixtureSet } from "../../fixtures/fixture-set";
import { AnalysisInputError, analyzeWav } from "../../server/analysis/index";
import { createAnalysisPool, PoolBusyError } from "../../server/workers/analysis-pool";

const run = promisify(execFile);
let dir: string;
const files: Record<string, string> = {};

beforeAll(() => {
  dir = mkdtempSync(join(tmpdir(), "tinelog-cli-"));
  for (const f of fixtureSet()) {
    if (["fork-a4-24bit-48k.wav", "chime-bar-c5-16bit-44k.wav", "bad-text-file.wav", "bad-truncated.wav"].includes(f.name)) {
      files[f.name] = join(dir, f.name);
      writeFileSync(files[f.name], f.bytes);
    }
  }
});
afterAll(() => rmSync(dir, { recursive: true, force: true }));

async function cli(args: string[]): Promise<{ code: number; stdout: string; stderr: string }> {
  try {
    const { stdout, stderr } = await run("node_modules/.bin/tsx", ["server/cli/analyze.ts", ...args], { cwd: process.cwd() });
    return { code: 0, stdout, stderr };
  } catch (e) {
    const err = e as { code: number; stdout: string; stderr: string };
    return { code: err.code, stdout: err.stdout, stderr: err.stderr };
  }
}

describe("analyze CLI", () => {
  it("one file with --json: one JSON object in the contract's shape, partials sorted by frequency", async () => {
    const r = await cli(["--json", files["chime-bar-c5-16bit-44k.wav"]]);
    expect(r.code).toBe(0);
    const lines = r.stdout.trim().split("\n");
    expect(lines).toHaveLength(1);
    const obj = analysisResultSchema.parse(JSON.parse(lines[0]));
    expect(obj.sampleRate).toBe(44100);
    const fs = obj.strikes[0].partials.map((p) => p.frequencyHz);
    expect(fs).toEqual([...fs].sort((a, b) => a - b));
    expect(fs.map(Math.round)).toEqual([523, 1443, 2828, 4674]);
    expect(obj.strikes[0].plot).toBeUndefined();
    for (const p of obj.strikes[0].partials) for (const k of ["frequencyHz", "amplitudeDb", "tauS", "t60S", "q", "fitR2", "beatHz"]) expect(p).toHaveProperty(k);
  });

  it("several files: one object per line; a bad file gives exit 1 and one stderr line naming it, no stack trace", async () => {
    const r = await cli(["--json", files["fork-a4-24bit-48k.wav"], files["bad-text-file.wav"], files["chime-bar-c5-16bit-44k.wav"], files["bad-truncated.wav"]]);
    expect(r.code).toBe(1);
    const lines = r.stdout.trim().split("\n");
    expect(lines).toHaveLength(2);
    expect(JSON.parse(lines[0]).file).toBe("fork-a4-24bit-48k.wav");
    expect(JSON.parse(lines[1]).file).toBe("chime-bar-c5-16bit-44k.wav");
    const err = r.stderr.trim().split("\n");
    expect(err).toHaveLength(2);
    expect(err[0]).toMatch(/bad-text-file\.wav: This file is text, not a WAV recording/);
    expect(err[1]).toMatch(/bad-truncated\.wav: The WAV file is cut short/);
    expect(r.stderr).not.toMatch(/\n\s+at /);
  });

  it("without --json: a readable table", async () => {
    const r = await cli([files["fork-a4-24bit-48k.wav"]]);
    expect(r.code).toBe(0);
    expect(r.stdout).toMatch(/strike 1 at 0\.20\d s/);
    expect(r.stdout).toMatch(/440\.0000/);
  });
});

describe("analysis pool", () => {
  it("returns the same result as the in-process core, rebuilds AnalysisInputError, and answers busy when full", async () => {
    const pool = createAnalysisPool({ maxThreads: 1, maxQueue: 1 });
    try {
      const a = pool.analyzeFile(files["fork-a4-24bit-48k.wav"]);
      const b = pool.analyzeFile(files["bad-text-file.wav"]);
      expect(pool.running).toBe(1);
      expect(pool.queued).toBe(1);
      await expect(pool.analyzeFile(files["chime-bar-c5-16bit-44k.wav"])).rejects.toBeInstanceOf(PoolBusyError);
      const busy = await pool.analyzeFile(files["chime-bar-c5-16bit-44k.wav"]).catch((e) => e);
      expect(busy.code).toBe("busy");
      const result = await a;
      const { readFileSync } = await import("node:fs");
      expect(result).toEqual(analyzeWav(new Uint8Array(readFileSync(files["fork-a4-24bit-48k.wav"]))));
      const err = await b.catch((e) => e);
      expect(err).toBeInstanceOf(AnalysisInputError);
      expect(err.code).toBe("not_wav");
      expect(err.message).toMatch(/This file is text/);
      const plotted = await pool.analyzeFile(files["fork-a4-24bit-48k.wav"], { plot: true });
      expect(plotted.strikes[0].plot?.envelopes).toHaveLength(plotted.strikes[0].partials.length);
      // A stored file that has gone missing is the server's problem, not the maker's: a plain Error.
      const missing = await pool.analyzeFile(join(dir, "no-such-file.wav")).catch((e) => e);
      expect(missing).toBeInstanceOf(Error);
      expect(missing).not.toBeInstanceOf(AnalysisInputError);
      expect(missing.message).toMatch(/stored recording could not be read/);
      expect(pool.queued).toBe(0);
      expect(pool.running).toBe(0);
    } finally {
      await pool.close();
    }
  });
});
