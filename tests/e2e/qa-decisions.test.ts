/**
 * QA's corrections in a real browser: the maker files a recording of another fork under F-0001 and
 * three flat forks on BTW-2612; qa finds F-0001 with the "/" search shortcut, voids the wrong
 * strike and sees the unit evaluated again, decides the two nonconforming forks, releases the batch
 * and issues F-0001's certificate (a scrapped fork is refused one); then qa selects three units of
 * BTW-2612 with a shift-click range and records one disposition for all of them. Strikes are
 * synthesised forks (tests/support/wav.ts) analysed by the real server's pool.
 */
import { mkdtempSync, rmSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import path from "node:path";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { demo, screenshot, signIn } from "../support/browser";
import { withServerAndBrowser } from "../support/e2e";
import { forkWav } from "../support/wav";
import { dispose, ledgerRow, openBatch, waitForVerdicts } from "./ledger-steps";

describe("qa voids a wrong strike, searches with /, and disposes of three units at once", () => {
  const e2e = withServerAndBrowser();
  let wavDir: string;
  const wrongFile = "F-0008-take-2.wav";

  beforeAll(() => {
    wavDir = mkdtempSync(path.join(tmpdir(), "tinelog-e2e-qa-"));
    // A recording of the sharp fork F-0008 (+12.6 cents, as seeded) filed under F-0001 by mistake.
    writeFileSync(path.join(wavDir, wrongFile), forkWav({ frequencyHz: 440 * 2 ** (12.6 / 1200), seed: 808 }));
    // Three forks 20 cents flat for BTW-2612, named after their units.
    for (const s of ["F-0011", "F-0012", "F-0013"]) writeFileSync(path.join(wavDir, `${s}.wav`), forkWav({ frequencyHz: 440 * 2 ** (-20 / 1200), seed: Number(s.slice(-2)) }));
  });
  afterAll(() => {
    if (wavDir) rmSync(wavDir, { recursive: true, force: true });
  });

  it("the maker uploads three flat forks to BTW-2612 and a wrong recording to F-0001", { timeout: 200_000 }, async () => {
    const { page } = e2e.browser;
    await signIn(page, e2e.server.baseUrl, demo.maker);
    await openBatch(page, "BTW-2612");
    await page.getByLabel("WAV files for the batch").setInputFiles(["F-0011", "F-0012", "F-0013"].map((s) => path.join(wavDir, `${s}.wav`)));
    for (const s of ["F-0011", "F-0012", "F-0013"]) await ledgerRow(page, s).getByText("Out of tolerance").waitFor({ timeout: 90_000 });

    await openBatch(page, "BTW-2611");
    await waitForVerdicts(page, ["F-0001", "F-0004", "F-0008", "F-0010"]);
    await ledgerRow(page, "F-0001").getByRole("link", { name: "F-0001" }).click();
    await page.getByRole("heading", { name: "Unit F-0001", level: 1 }).waitFor();
    await page.getByLabel("WAV recordings for this unit").setInputFiles(path.join(wavDir, wrongFile));
    await page.getByRole("list", { name: "Strikes" }).getByText(wrongFile).waitFor();
    await page.getByLabel("Why").getByText(/^Fundamental \+\d+\.\d ¢ outside ±5 ¢$/).waitFor({ timeout: 90_000 });
    await page.getByRole("button", { name: "Sign out" }).click();
    await page.getByRole("heading", { name: "Sign in" }).waitFor();
  });

  it("qa presses / anywhere, types the serial and opens the unit from the results", async () => {
    const { page } = e2e.browser;
    await signIn(page, e2e.server.baseUrl, demo.qa);
    // The review queue says why each unit is out of tolerance.
    await page.getByRole("list", { name: "Units awaiting review" }).getByText(/^Fundamental \+\d+\.\d ¢ outside ±5 ¢$/).first().waitFor();
    await page.locator("body").click();
    await page.keyboard.press("/");
    expect(await page.evaluate(() => document.activeElement?.getAttribute("type"))).toBe("search");
    await page.keyboard.type("f-0001");
    const results = page.getByRole("region", { name: "Search results" });
    await results.getByRole("region", { name: "Units" }).getByRole("link", { name: /F-0001/ }).waitFor();
    await screenshot(page, "e2e-qa-search");
    await page.keyboard.press("Enter");
    await page.getByRole("heading", { name: "Unit F-0001", level: 1 }).waitFor();
  });

  it("qa voids the wrong strike: it stays listed, struck through, and the unit is within tolerance again", async () => {
    const { page } = e2e.browser;
    await page.getByRole("button", { name: `Void ${wrongFile}…` }).click();
    const form = page.getByRole("form", { name: `Void ${wrongFile}` });
    await form.getByLabel("Why is this strike void?").fill("no");
    await form.getByRole("button", { name: "Void strike" }).click();
    await form.getByText("Say why, in at least 3 characters.").waitFor();
    await form.getByLabel("Why is this strike void?").fill("Recording of F-0008 filed under F-0001 by mistake.");
    await form.getByRole("button", { name: "Void strike" }).click();
    const item = page.getByRole("list", { name: "Strikes" }).getByRole("listitem").filter({ hasText: wrongFile });
    await item.getByText(/by Tobias Renn: Recording of F-0008 filed under F-0001 by mistake\.$/).waitFor();
    expect(await item.getByRole("link", { name: wrongFile }).evaluate((e) => getComputedStyle(e).textDecorationLine)).toBe("line-through");
    await page.getByRole("heading", { name: "Evaluation" }).locator("..").getByText("Within tolerance").waitFor();
    await page.getByRole("list", { name: "Unit history" }).getByText("Strike voided").waitFor();
    await screenshot(page, "e2e-qa-voided");
  });

  it("qa decides the two nonconforming forks, releases, is refused a scrapped fork's certificate and issues F-0001's", { timeout: 120_000 }, async () => {
    const { page } = e2e.browser;
    await page.getByRole("link", { name: "← Batch BTW-2611" }).click();
    await page.getByRole("heading", { name: "Batch BTW-2611", level: 1 }).waitFor();
    await dispose(page, "F-0004", "use_as_is", "Practice fork: the customer accepts −9 cents in writing.");
    await page.getByRole("link", { name: "← Batch BTW-2611" }).click();
    await dispose(page, "F-0008", "scrap", "Too sharp to rework within the tine length left.");
    await page.getByRole("link", { name: "← Batch BTW-2611" }).click();
    await page.getByRole("button", { name: "Release batch…" }).click();
    await page.getByRole("button", { name: "Release BTW-2611 now" }).click();
    await page.getByRole("status").filter({ hasText: /^Released \d/ }).waitFor();

    await ledgerRow(page, "F-0008").getByRole("link", { name: "F-0008" }).click();
    await page.getByText(/^Unit F-0008 was scrapped \(disposition of .*\)\. A scrapped unit gets no certificate\.$/).waitFor();
    expect(await page.getByRole("form", { name: "Issue a certificate" }).count()).toBe(0);
    await page.getByRole("link", { name: "← Batch BTW-2611" }).click();

    await ledgerRow(page, "F-0001").getByRole("link", { name: "F-0001" }).click();
    const form = page.getByRole("form", { name: "Issue a certificate" });
    await form.getByLabel("Recipient e-mail").fill("m.testcustomer@example.org");
    await form.getByRole("button", { name: "Issue", exact: true }).click();
    await page.getByRole("status").filter({ hasText: /Certificate .+ issued/ }).waitFor();
    await page.getByRole("list", { name: "Certificates" }).getByText("Current").waitFor();
  });

  it("qa ticks F-0011, shift-clicks F-0013 and records one disposition for the three", async () => {
    const { page } = e2e.browser;
    await openBatch(page, "BTW-2612");
    await ledgerRow(page, "F-0011").getByRole("checkbox", { name: "Select F-0011" }).click();
    await ledgerRow(page, "F-0013").getByRole("checkbox", { name: "Select F-0013" }).click({ modifiers: ["Shift"] });
    const form = page.getByRole("form", { name: "Disposition for the selected units" });
    await form.getByText("3 units selected: F-0011, F-0012, F-0013").waitFor();
    // A unit not measured cannot be ticked.
    expect(await ledgerRow(page, "F-0014").getByRole("checkbox").isDisabled()).toBe(true);
    await form.getByLabel("Decision for all of them").selectOption("rework");
    await form.getByLabel("Reason").fill("All three 20 cents flat: shorten the tines.");
    await screenshot(page, "e2e-qa-bulk-selected");
    await form.getByRole("button", { name: "Record for 3 units" }).click();
    for (const s of ["F-0011", "F-0012", "F-0013"]) await ledgerRow(page, s).getByText("Rework and measure again").waitFor();
    expect(await page.getByRole("form", { name: "Disposition for the selected units" }).count()).toBe(0);
    await screenshot(page, "e2e-qa-bulk-done");
  });
});
