/**
 * The strike page in a real browser: the demo maker opens a seeded strike of
 * BTW-2611 and finds the waveform, the spectrum with its partial markers and the decay plots drawn
 * — each canvas checked for pixels of the series' own colour, not just for axes — and the labels
 * on the spectrum match the partials table and the API's labels. A recording that cannot be
 * analysed shows its waveform and the reason, after the page has polled its way from "queued".
 *
 * Outside references: the WAV is decoded independently with the `wavefile` npm package to check
 * the duration the player shows; the silent file for the failure case is written with it too.
 */
import { beforeAll, describe, expect, it } from "vitest";
import type { Page } from "playwright-core";
import wavefile from "wavefile";
import type { StrikeDetail, UnitDetail } from "../../shared/schemas/strike.ts";
import { execFileSync } from "node:child_process";
import { mkdtempSync, readFileSync, rmSync } from "node:fs";
import { tmpdir } from "node:os";
import path from "node:path";
import { chromium } from "playwright-core";
import { forkWav } from "../support/wav";
import { chromiumArgs, demo, findChromium, screenshot, signIn } from "../support/browser";
import { colouredPixels, eventuallyPositive } from "../support/canvas";
import { apiGet, batchByCode, withServerAndBrowser } from "../support/e2e";

const { WaveFile } = wavefile;

/** Uploads WAV bytes as a strike of `unitId` from inside the signed-in page (its session cookie). */
async function uploadFromPage(page: Page, unitId: string, wav: Uint8Array, name: string): Promise<{ status: number; body: { id: string } }> {
  return page.evaluate(
    async ({ unitId, bytes, name }) => {
      const form = new FormData();
      form.append("audio", new File([new Uint8Array(bytes)], name, { type: "audio/wav" }));
      const r = await fetch(`/api/units/${unitId}/strikes`, { method: "POST", body: form, credentials: "same-origin" });
      return { status: r.status, body: await r.json() };
    },
    { unitId, bytes: Array.from(wav), name },
  );
}

describe("the strike page", () => {
  const e2e = withServerAndBrowser();
  let strike: StrikeDetail;

  beforeAll(async () => {
    const { page } = e2e.browser;
    await signIn(page, e2e.server.baseUrl, demo.maker);
    const detail = await batchByCode(page, "BTW-2611");
    const unit = await apiGet<UnitDetail>(page, `/api/units/${detail.rows[0].id}`);
    // The seed analyses its strikes at start; wait for the first one to be done.
    for (let i = 0; i < 180; i++) {
      strike = await apiGet<StrikeDetail>(page, `/api/strikes/${unit.strikes[0].id}`);
      if (strike.state === "done" || strike.state === "failed") break;
      await new Promise((r) => setTimeout(r, 500));
    }
    expect(strike.state).toBe("done");
  });

  it("draws the waveform, and its length agrees with an independent decoding of the WAV", async () => {
    const { page } = e2e.browser;
    await page.goto(`${e2e.server.baseUrl}/strikes/${strike.id}`);
    await page.getByRole("heading", { name: `Strike of ${strike.unit.serial}`, level: 1 }).waitFor();
    // Play is enabled once the audio is fetched and decoded.
    await page.locator("button:not([disabled])", { hasText: /^Play$/ }).waitFor({ timeout: 30_000 });
    // The waveform's wave colour (#78b0b5, src/features/strike-viz/lib/colours.ts).
    const wave = await eventuallyPositive(() => colouredPixels(page, '[data-testid="waveform"]', ["#78b0b5", "#1f5d65"]), "waveform");
    expect(wave).toBeGreaterThan(2000);

    const bytes = await page.evaluate(async (id) => {
      const r = await fetch(`/api/strikes/${id}/audio`, { credentials: "same-origin" });
      return Array.from(new Uint8Array(await r.arrayBuffer()));
    }, strike.id);
    const wav = new WaveFile(new Uint8Array(bytes));
    const fmt = wav.fmt as { sampleRate: number; numChannels: number; bitsPerSample: number };
    const frames = (wav.data as { chunkSize: number }).chunkSize / (fmt.numChannels * (fmt.bitsPerSample / 8));
    const durationS = frames / fmt.sampleRate;
    const shown = await page.getByLabel("Playback position").textContent();
    const total = Number(/\/\s*([\d.]+) s/.exec(shown ?? "")?.[1]);
    // The browser decodes at the file's rate; its duration matches to a millisecond.
    expect(Math.abs(total - durationS)).toBeLessThan(0.002);
    // The onset marker is in the page's text too.
    await page.getByText(`Strike onsets marked at ${strike.result!.strikes[0].onsetS.toFixed(3)} s.`).waitFor();
  });

  it("draws the spectrum with a marker per partial, labelled as in the table and the API", async () => {
    const { page } = e2e.browser;
    const spectrum = page.locator(".tl-spectrum");
    await spectrum.waitFor();
    // Spectrum line (#1f5d65) and partial markers (#9c3526) must both be on the canvas.
    expect(await eventuallyPositive(() => colouredPixels(page, ".tl-spectrum", ["#1f5d65"]), "spectrum line")).toBeGreaterThan(500);
    expect(await colouredPixels(page, ".tl-spectrum", ["#9c3526"])).toBeGreaterThan(100);

    const partials = strike.result!.strikes[0].partials;
    const expected = partials.map((_, i) => strike.labels[i] ?? `partial ${i + 1}`);
    // Marker labels are laid over the canvas when uPlot draws; wait for all of them.
    await expect.poll(() => spectrum.locator(".tl-marker-partial").count(), { timeout: 15_000 }).toBe(expected.length);
    const markerLabels = await spectrum.locator(".tl-marker-partial").allTextContents();
    const tableLabels = await page.getByRole("table").filter({ hasText: "Frequency (Hz)" }).locator(".tl-partial-label").allTextContents();
    expect(markerLabels).toEqual(expected);
    expect(tableLabels).toEqual(expected);
    expect(expected).toContain("Fundamental");

    // Markers sit left to right in frequency order (partials are sorted by frequency).
    const lefts = await spectrum.locator(".tl-marker-partial").evaluateAll((els) => els.map((e) => e.getBoundingClientRect().left + e.getBoundingClientRect().width / 2));
    for (let i = 1; i < lefts.length; i++) expect(lefts[i]).toBeGreaterThan(lefts[i - 1]);

    // Hum is marked as ignored where the analysis found it.
    if (strike.result!.strikes[0].plot!.humHz.length) expect(await spectrum.locator(".tl-marker-hum").first().textContent()).toBe("hum (ignored)");

    // The table's fundamental frequency is the API's, to the shown precision.
    const f0 = partials[0].frequencyHz;
    const cell = await page.getByRole("table").filter({ hasText: "Frequency (Hz)" }).locator('tr[data-partial-index="0"] td').first().textContent();
    expect(Math.abs(Number(/^[\d.]+/.exec(cell ?? "")?.[0]) - f0)).toBeLessThan(1e-3);
  });

  it("draws a decay plot per partial with its envelope and fit line", async () => {
    const { page } = e2e.browser;
    const decays = page.locator(".tl-decay");
    expect(await decays.count()).toBe(strike.result!.strikes[0].partials.length);
    // Envelope #4a8f96 and fit #9c3526 in the first decay plot.
    const first = await eventuallyPositive(() => colouredPixels(page, ".tl-decay-item:first-of-type .tl-decay", ["#4a8f96"]), "decay envelope");
    expect(first).toBeGreaterThan(200);
    expect(await colouredPixels(page, ".tl-decay-item:first-of-type .tl-decay", ["#9c3526"])).toBeGreaterThan(200);
    const p0 = strike.result!.strikes[0].partials[0];
    await page.getByText(`Shaded: the evaluation range, ${p0.fitStartS.toFixed(2)}–${p0.fitEndS.toFixed(2)} s.`).first().waitFor();
    await screenshot(page, "e2e-strike-page");
  });

  it("shows the waveform and the reason for a recording that could not be analysed, after polling from queued", async () => {
    const { page } = e2e.browser;
    const open = await batchByCode(page, "BTW-2612");
    // One second of digital silence, 16-bit mono 48 kHz, written by wavefile (not our encoder).
    const silent = new WaveFile();
    silent.fromScratch(1, 48_000, "16", new Int16Array(48_000));
    const accepted = await uploadFromPage(page, open.rows[open.rows.length - 1].id, silent.toBuffer(), "silent-take.wav");
    expect(accepted.status).toBe(202);
    await page.goto(`${e2e.server.baseUrl}/strikes/${accepted.body.id}`);
    // Without a reload the page moves on from queued/analysing to the failure and its reason.
    await page.getByText("This recording could not be analysed").waitFor({ timeout: 60_000 });
    await page.getByText(/digital silence/).waitFor();
    await page.locator('[data-testid="waveform"]').waitFor();
    expect(await page.locator(".tl-spectrum").count()).toBe(0);
    await screenshot(page, "e2e-strike-failed");
  });

  it("a tone under a linear fade (written by sox) shows the not-exponential warning, the mark and the extrapolated T60", async () => {
    const { page } = e2e.browser;
    const open = await batchByCode(page, "BTW-2612");
    const dir = mkdtempSync(path.join(tmpdir(), "tinelog-fade-"));
    try {
      const file = path.join(dir, "fade.wav");
      execFileSync("sox", ["-n", "-r", "48000", "-b", "24", file, "synth", "4", "sine", "440", "fade", "t", "0", "4", "3.9"]);
      const accepted = await uploadFromPage(page, open.rows[open.rows.length - 2].id, readFileSync(file), "faded-take.wav");
      expect(accepted.status).toBe(202);
      await page.goto(`${e2e.server.baseUrl}/strikes/${accepted.body.id}`);
      await page.getByText("A decay is not exponential").waitFor({ timeout: 60_000 });
      await page.getByText(/The decay of the partial at 440\.0 Hz is not exponential/).waitFor();
      const table = page.getByRole("table").filter({ hasText: "Frequency (Hz)" });
      await table.getByText("τ unreliable: decay not exponential").waitFor();
      await expect(table.getByText(/^from \d+ dB$/).count()).resolves.toBe(1);
      await page.getByText(/T60 [\d.]+ s \(extrapolated from \d+ dB\)/).waitFor();
      await screenshot(page, "e2e-strike-linear-fade");
    } finally {
      rmSync(dir, { recursive: true, force: true });
    }
  });

  it("records a strike from a microphone, uploads it through the unit page and shows it on its strike page", async () => {
    // Chromium's built-in fake microphone (a tone with periodic beeps) stands in for the outside
    // world; permission is granted by the fake prompt. Everything after the microphone is real.
    const userDataDir = mkdtempSync(path.join(tmpdir(), "tinelog-chromium-mic-"));
    const context = await chromium.launchPersistentContext(userDataDir, {
      executablePath: findChromium(),
      headless: true,
      args: [...chromiumArgs, "--use-fake-ui-for-media-stream", "--use-fake-device-for-media-stream"],
      viewport: { width: 1180, height: 820 },
      locale: "en-GB",
      timezoneId: "UTC",
    });
    try {
      const page = context.pages()[0] ?? (await context.newPage());
      await signIn(page, e2e.server.baseUrl, demo.maker);
      const open = await batchByCode(page, "BTW-2612");
      const unitId = open.rows[0].id;
      await page.goto(`${e2e.server.baseUrl}/app/units/${unitId}`);
      const recorder = page.getByRole("region", { name: "Record a strike" });
      await recorder.getByLabel("Stop at the latest after").selectOption("5");
      await recorder.getByRole("button", { name: "Record" }).click();
      await recorder.getByText(/Keep quiet/).waitFor();
      await recorder.getByRole("meter", { name: "Input level" }).waitFor();
      const use = recorder.getByRole("button", { name: "Use this recording" });
      await use.waitFor({ timeout: 30_000 });
      await screenshot(page, "e2e-recorder-review");
      await use.click();
      await recorder.getByText(/went to the uploads/).waitFor();

      // The server received a 24-bit mono WAV of about five seconds.
      let unit: UnitDetail | undefined;
      for (let i = 0; i < 120; i++) {
        unit = await apiGet<UnitDetail>(page, `/api/units/${unitId}`);
        if (unit.strikes.some((s) => s.originalName.startsWith("strike-") && (s.state === "done" || s.state === "failed"))) break;
        await new Promise((r) => setTimeout(r, 500));
      }
      const recorded = unit!.strikes.find((s) => s.originalName.startsWith("strike-"))!;
      expect(recorded.channels).toBe(1);
      expect(recorded.durationS).toBeGreaterThan(4.5);
      expect(recorded.durationS).toBeLessThan(5.5);
      const audio = await page.evaluate(async (id) => Array.from(new Uint8Array(await (await fetch(`/api/strikes/${id}/audio`)).arrayBuffer())), recorded.id);
      const wav = new WaveFile(new Uint8Array(audio));
      expect((wav.fmt as { bitsPerSample: number }).bitsPerSample).toBe(24);

      await page.goto(`${e2e.server.baseUrl}/strikes/${recorded.id}`);
      await page.locator("button:not([disabled])", { hasText: /^Play$/ }).waitFor({ timeout: 30_000 });
      expect(await eventuallyPositive(() => colouredPixels(page, '[data-testid="waveform"]', ["#78b0b5", "#1f5d65"]), "recorded waveform")).toBeGreaterThan(1000);
    } finally {
      await context.close();
      rmSync(userDataDir, { recursive: true, force: true });
    }
  });

  it("overlays a unit's strikes on its page, named by file, time and support, with each partial's shift", async () => {
    const { page } = e2e.browser;
    // A second strike of the seeded unit, suspended this time: 3 cents sharp, same overtone ratio.
    const bytes = Array.from(forkWav({ frequencyHz: strike.result!.strikes[0].partials[0].frequencyHz * 2 ** (3 / 1200), seed: 31 }));
    const accepted = await page.evaluate(
      async ({ unitId, bytes }) => {
        const form = new FormData();
        form.append("audio", new File([new Uint8Array(bytes)], "suspended-take.wav", { type: "audio/wav" }));
        form.append("support", "suspended");
        const r = await fetch(`/api/units/${unitId}/strikes`, { method: "POST", body: form, credentials: "same-origin" });
        return { status: r.status, body: await r.json() };
      },
      { unitId: strike.unit.id, bytes },
    );
    expect(accepted.status).toBe(202);
    await page.goto(`${e2e.server.baseUrl}/app/units/${strike.unit.id}`);
    const compare = page.locator('[data-testid="compare-strikes"]');
    await compare.waitFor({ timeout: 60_000 });
    const headers = await compare.getByRole("table").getByRole("columnheader").allTextContents();
    // Each strike by its file name, time and support (two strikes may share the support, never the file and time).
    expect(headers[1]).toMatch(new RegExp(`^${strike.originalName.replace(".", "\\.")} · .+ · Held in hand$`));
    expect(headers[2]).toMatch(/^suspended-take\.wav · .+ · Suspended$/);
    // Both spectra drawn (#1f5d65 first, #9c3526 second) on the overlay.
    expect(await eventuallyPositive(() => colouredPixels(page, '[data-testid="compare-strikes"] .tl-chart', ["#9c3526"]), "second spectrum")).toBeGreaterThan(300);
    // The fundamental moved by about +3 cents against the first strike (synthesised; the analysis is exact to well under a cent here).
    const delta = await compare.getByRole("row", { name: /^Fundamental/ }).getByTestId("compare-delta").textContent();
    expect(delta).toMatch(/^\+(2\.[5-9]|3\.[0-5]) cents, T60 ×[\d.]+ against the first$/);
    await screenshot(page, "e2e-compare-strikes");
  });
});
