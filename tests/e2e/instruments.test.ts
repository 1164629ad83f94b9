/**
 * Instruments in a real browser: the owner adds a recorder, uploads a reference tone recorded
 * with it, and reads the offset the screen reports; a strike recorded with that recorder then
 * shows the correction applied, on the unit page and on the strike page, and the recorder stays
 * chosen when the page is opened again.
 *
 * Expected numbers follow from how the recordings were made: the reference tone is a 1000 Hz tone
 * written at 1000 × (1 + 73·10⁻⁶) Hz and labelled 48 kHz, as a recorder whose clock is 73 ppm off
 * records it, so the offset shown must be +73.00 ppm (the offset's definition); the fork's 440 Hz
 * is written 73 ppm high the same way, so the corrected fundamental reads 440.000 Hz.
 */
import { describe, expect, it } from "vitest";
import { synthReferenceToneWav, synthStrikeWav } from "../../seeds/synth.ts";
import { demo, screenshot, signIn } from "../support/browser";
import { batchByCode, withServerAndBrowser } from "../support/e2e";

const session = withServerAndBrowser();

describe("instruments", () => {
  it("the owner adds a recorder and calibrates it from a reference tone; a strike from it shows the correction", async () => {
    const { page } = session.browser;
    const { baseUrl } = session.server;
    await signIn(page, baseUrl, demo.owner);

    await page.getByRole("navigation", { name: "Main" }).getByRole("link", { name: "Instruments" }).click();
    await page.getByRole("heading", { name: "Instruments", level: 1 }).waitFor();
    const form = page.getByRole("form", { name: "New instrument" });
    await form.getByLabel("Kind").selectOption("recorder");
    await form.getByLabel("Name").fill("Test bench recorder");
    await form.getByLabel("Serial (optional)").fill("E2E-73");
    await form.getByRole("button", { name: "Add instrument" }).click();
    await page.getByRole("heading", { name: "Test bench recorder", level: 1 }).waitFor();
    await expect(page.getByText("Never calibrated").first().isVisible()).resolves.toBe(true);

    await page.getByLabel("Reference recordings").setInputFiles({ name: "reference-1000Hz.wav", mimeType: "audio/wav", buffer: Buffer.from(synthReferenceToneWav({ frequencyHz: 1000, offsetPpm: 73, seed: 7302, durationS: 5 })) });
    // The frequency is read from the file name; the reference's own figures are typed in.
    await expect(page.getByLabel("Reference frequency of file 1 (Hz)").inputValue()).resolves.toBe("1000");
    await page.getByLabel("Reference uncertainty U (Hz, k = 2)").fill("0.001");
    await page.getByLabel("Reference certificate number").fill("GEN-E2E-1");
    await page.getByRole("button", { name: "Calibrate" }).click();
    const done = page.getByRole("status").filter({ hasText: /Calibration CAL-\d{4}-\d{4} recorded/ });
    await done.waitFor({ timeout: 30_000 });
    expect(await done.innerText()).toMatch(/Clock offset \+73\.00 ppm ± 1\.0 ppm \(k = 2\)/);
    await expect(page.getByTestId("current-calibration").innerText()).resolves.toMatch(/\+73\.00 ppm ± 1\.0 ppm \(k = 2\)/);
    await page.getByTestId("offset-chart").waitFor();
    console.log(`screenshot: ${await screenshot(page, "instruments-calibrated-recorder")}`);

    // A strike of an unmeasured unit, recorded with the new recorder.
    const batch = await batchByCode(page, "BTW-2612");
    const unit = batch.rows[0];
    await page.goto(`${baseUrl}/app/units/${unit.id}`);
    await page.getByRole("heading", { name: `Unit ${unit.serial}` }).waitFor();
    await page.getByLabel("Recorded with").selectOption({ label: "Test bench recorder" });
    await expect(page.getByText("Calibrated: its offset is corrected.").isVisible()).resolves.toBe(true);
    const wav = synthStrikeWav({ durationS: 3, seed: 7303, partials: [{ frequencyHz: 440 * (1 + 73e-6), amplitude: 0.3, tauS: 4 }, { frequencyHz: 440 * 6.1 * (1 + 73e-6), amplitude: 0.08, tauS: 0.4 }] });
    await page.getByLabel("WAV recordings for this unit").setInputFiles({ name: `${unit.serial}-a.wav`, mimeType: "audio/wav", buffer: Buffer.from(wav) });
    const applied = page.getByRole("list", { name: "Corrections applied" });
    await applied.waitFor({ timeout: 60_000 });
    expect(await applied.innerText()).toMatch(/Test bench recorder: CAL-\d{4}-\d{4} applied, offset \+73\.00 ppm removed/);
    await expect(page.getByText("Traceable", { exact: true }).isVisible()).resolves.toBe(true);
    const measured = page.getByRole("table", { name: "Requirements as measured" }).getByRole("row", { name: /Fundamental/ });
    expect(await measured.innerText()).toMatch(/440\.000 ± /);

    // The choice is remembered for this person in this browser.
    await page.reload();
    await page.getByRole("heading", { name: `Unit ${unit.serial}` }).waitFor();
    // The list of instruments arrives after the page: wait for it, then read the choice.
    const recordedWith = page.getByLabel("Recorded with");
    await recordedWith.locator("option", { hasText: "Test bench recorder" }).waitFor({ state: "attached" });
    await expect.poll(() => recordedWith.evaluate((el) => (el as HTMLSelectElement).selectedOptions[0]?.textContent), { timeout: 10_000 }).toBe("Test bench recorder");

    await page.getByRole("link", { name: `${unit.serial}-a.wav` }).click();
    const correction = page.getByTestId("strike-correction");
    await correction.waitFor();
    const text = await correction.innerText();
    expect(text).toMatch(/Clock offset \+73\.00 ppm removed from every frequency/);
    expect(text).toMatch(/Fundamental 440\.03\d\d Hz as recorded → 440\.000\d Hz corrected/);
    console.log(`screenshot: ${await screenshot(page, "instruments-strike-correction")}`);
  });
});
