/**
 * The new kinds of specification in a real browser: qa writes a chime-tube specification by its
 * strike note and a note name at the customer's reference pitch with a tolerance in Hz (each
 * shown in the other units as typed), makes a bowl specification from a master unit's recording,
 * exports a specification as a file and imports it (a bad file first, with its field messages);
 * Fernhollow's owner reads a tube's strike note on its strike page with the partials it came from.
 *
 * Expected numbers: equal temperament at A4 (ISO 16:1975 A4 = 440 Hz), C5 = A4·2^(3/12):
 * 523.251 Hz at 440 Hz, 525.630 Hz at 442 Hz; ±0.5 Hz at 525.630 Hz is 1200·log2(1 + 0.5/525.630)
 * = 1.65 cents and 10⁶·0.5/525.630 = 951 ppm.
 */
import { mkdtempSync, readFileSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import path from "node:path";
import { describe, expect, it } from "vitest";
import type { StrikeDetail, UnitDetail } from "../../shared/schemas/strike.ts";
import type { BatchDetail, BatchSummary } from "../../shared/schemas/batch.ts";
import { demo, screenshot, signIn } from "../support/browser";
import { apiGet, withServerAndBrowser } from "../support/e2e";
import { bowlStrikeWav } from "../support/wav";

describe("specifications by strike note, note name, Hz tolerance, master unit and file", () => {
  const e2e = withServerAndBrowser({ viewport: { width: 1280, height: 900 } });
  const dir = mkdtempSync(path.join(tmpdir(), "tinelog-spec-kinds-"));

  it("qa writes a chime tube by its strike note, C5 at A4 = 442 Hz, ±0.5 Hz, and reads each conversion as it types", { timeout: 120_000 }, async () => {
    const { page } = e2e.browser;
    await signIn(page, e2e.server.baseUrl, demo.qa);
    await page.goto(`${e2e.server.baseUrl}/app/specifications/new?family=tube`);
    await page.getByRole("heading", { name: /^Template: Tube/ }).waitFor();
    const note = page.getByRole("group", { name: "Partial 1" });
    expect(await note.getByLabel("Target kind").inputValue()).toBe("strike_note");
    expect(await note.getByLabel("Strike note target (Hz)").inputValue()).toBe("C5");
    await note.getByText("C5 = 523.251 Hz at A4 = 440 Hz").waitFor();
    await page.getByLabel("Reference pitch A4 (Hz)").fill("442");
    await note.getByText("C5 = 525.630 Hz at A4 = 442 Hz").waitFor();
    await note.getByLabel("Unit").selectOption("hz");
    await note.getByLabel("Tolerance (± Hz)").fill("0.5");
    await note.getByText("= ±1.65 cents, ±951 ppm at 525.63 Hz").waitFor();
    await note.getByText(/the common fundamental of the partials that stand near 2\u00a0:\u00a03\u00a0:\u00a04/).waitFor();
    await page.getByLabel("Name").fill("Chime tube C5 at 442");
    await screenshot(page, "e2e-spec-tube-strike-note");
    await page.getByRole("button", { name: "Create specification" }).click();
    await page.getByRole("heading", { name: "Chime tube C5 at 442", level: 1 }).waitFor();
    const row = page.getByRole("row").filter({ hasText: "Strike note" }).first();
    await row.getByText("strike note C5 · 525.630 Hz").waitFor();
    await row.getByText("±0.5 Hz (±1.65 cents, ±951 ppm)").waitFor();
    await page.getByText("A4 = 442 Hz").first().waitFor();
  });

  it("qa says a note name that is not one is wrong, in place", async () => {
    const { page } = e2e.browser;
    await page.goto(`${e2e.server.baseUrl}/app/specifications/new?family=handbell`);
    const prime = page.getByRole("group", { name: "Partial 2" });
    expect(await prime.getByLabel("Label").inputValue()).toBe("Prime");
    await prime.getByLabel("Target (Hz)").fill("H4");
    await page.getByRole("button", { name: "Create specification" }).click();
    await prime.getByText("Write a note as a letter A–G, an optional # or b, and an octave: A4, C#5, Bb3").waitFor();
    // Bells are shells: no vibrating length to ask for.
    expect(await page.getByLabel("Vibrating length (mm, optional)").count()).toBe(0);
  });

  it("qa makes a bowl specification from a master unit's recording, sees which partials became targets, and creates it", { timeout: 120_000 }, async () => {
    const { page } = e2e.browser;
    const wav = path.join(dir, "master-bowl.wav");
    writeFileSync(wav, bowlStrikeWav({ fundamentalHz: 196, seed: 5 }));
    await page.goto(`${e2e.server.baseUrl}/app/specifications/new?family=bowl`);
    await page.getByRole("button", { name: "A master unit" }).click();
    const master = page.getByRole("group", { name: "From a master unit" });
    await master.getByLabel("Master recording (WAV)").setInputFiles(wav);
    await master.getByLabel("Tolerance on the fundamental (± cents)").fill("8");
    await master.getByRole("button", { name: "Make a draft from the master" }).click();
    await page.getByRole("heading", { name: "Draft from the master recording master-bowl.wav" }).waitFor({ timeout: 60_000 });
    const partials = page.getByRole("table", { name: "Partials of the master" });
    await partials.getByRole("cell", { name: "Fundamental", exact: true }).waitFor();
    expect(await partials.getByRole("row").count()).toBe(5); // header + four partials, all taken
    const fundamental = page.getByRole("group", { name: "Partial 1" });
    expect(Number(await fundamental.getByLabel("Target (Hz)").inputValue())).toBeCloseTo(196, 0);
    expect(await fundamental.getByLabel("Tolerance (± cents)").inputValue()).toBe("8");
    await screenshot(page, "e2e-spec-from-master");
    await page.getByRole("button", { name: "Create specification" }).click();
    await page.getByRole("heading", { name: "Singing bowl from master", level: 1 }).waitFor();
    await page.getByText(/From the master unit recorded in "master-bowl.wav"/).waitFor();
  });

  it("qa exports the specification as a file, is told what is wrong with a spoilt copy, and imports the good one", { timeout: 120_000 }, async () => {
    const { page } = e2e.browser;
    const download = page.waitForEvent("download");
    await page.getByRole("link", { name: "Export file" }).click();
    const file = path.join(dir, "export.json");
    await (await download).saveAs(file);
    const good = JSON.parse(readFileSync(file, "utf8"));
    expect(good).toMatchObject({ format: "tinelog-specification", version: 1 });
    const spoilt = structuredClone(good);
    spoilt.version = 7;
    spoilt.specification.partials[1].ratio = -2;
    const bad = path.join(dir, "spoilt.json");
    writeFileSync(bad, JSON.stringify(spoilt));

    await page.goto(`${e2e.server.baseUrl}/app/specifications/new`);
    await page.getByRole("button", { name: "A file" }).click();
    await page.getByLabel("Specification file").setInputFiles(bad);
    const alert = page.getByRole("alert").filter({ hasText: "spoilt.json cannot be used as it is" });
    await alert.getByText("This file is of another version; this Tinelog reads version 1").waitFor();
    await alert.getByText("partial 2, ratio").waitFor();
    await alert.getByText("Ratio must be greater than 0").waitFor();
    await screenshot(page, "e2e-spec-import-errors");

    await page.getByLabel("Specification file").setInputFiles(file);
    await page.getByRole("heading", { name: /^Draft from export\.json from Brightwater Tuning Works, version 1/ }).waitFor();
    expect(await page.getByLabel("Name").inputValue()).toBe("Singing bowl from master");
    await page.getByLabel("Name").fill("Singing bowl, second site");
    await page.getByRole("button", { name: "Create specification" }).click();
    await page.getByRole("heading", { name: "Singing bowl, second site", level: 1 }).waitFor();
  });

  it("Fernhollow's owner reads a chime tube's strike note and the partials it was read from", { timeout: 180_000 }, async () => {
    const { page, context } = e2e.browser;
    await context.clearCookies();
    await signIn(page, e2e.server.baseUrl, demo.other);
    const { batches } = await apiGet<{ batches: BatchSummary[] }>(page, "/api/batches");
    const id = batches.find((b) => b.code === "FHC-T-07")!.id;
    let unitId = "";
    for (let i = 0; i < 240 && !unitId; i++) {
      const b = await apiGet<BatchDetail>(page, `/api/batches/${id}`);
      if (b.rows.every((r) => r.verdict)) unitId = b.rows[0].id;
      else await page.waitForTimeout(500);
    }
    const unit = await apiGet<UnitDetail>(page, `/api/units/${unitId}`);
    const strike = await apiGet<StrikeDetail>(page, `/api/strikes/${unit.strikes[0].id}`);
    await page.goto(`${e2e.server.baseUrl}/strikes/${strike.id}`);
    const panel = page.getByRole("region", { name: "Strike note" });
    await panel.waitFor();
    const used = panel.getByRole("list", { name: "Partials used for the strike note" }).getByRole("listitem");
    expect(await used.count()).toBe(3);
    expect(await used.allTextContents()).toEqual(["2", "3", "4"].map((n) => expect.stringContaining(`${n} × the strike note`)) as unknown as string[]);
    await panel.getByText(`${strike.strikeNote!.frequencyHz.toFixed(3)}`, { exact: false }).waitFor();
    // The spectrum marks the heard pitch, and the table names each partial's place in the series.
    await page.locator(".tl-spectrum .tl-marker-note").waitFor();
    await page.getByRole("table", { name: "Partials of this strike" }).getByText("strike note ×2").waitFor();
    await screenshot(page, "e2e-strike-note");
  });
});
