/**
 * The daily loop in a real browser: the demo maker drops two recordings on
 * batch BTW-2612 and watches the ledger fill without a reload; the demo qa user finds BTW-2611's
 * two forks out of tolerance, is refused a release while they are open, disposes of them and
 * releases the batch. The strikes are synthesised (tests/support/wav.ts) and analysed by the real
 * server's analysis pool.
 */
import { mkdtempSync, rmSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import path from "node:path";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { demo, screenshot, signIn } from "../support/browser";
import { withServerAndBrowser } from "../support/e2e";
import { synthStrikeWav } from "../../seeds/synth";
import { forkWav } from "../support/wav";
import { dispose, ledgerRow, openBatch, waitForVerdicts } from "./ledger-steps";

describe("the ledger loop: maker uploads, qa disposes and releases", () => {
  const e2e = withServerAndBrowser();
  let wavDir: string;

  beforeAll(async () => {
    wavDir = mkdtempSync(path.join(tmpdir(), "tinelog-e2e-wav-"));
    // 440 Hz is on target (±5 cents in the demo spec); 440·2^(−20/1200) Hz is 20 cents flat.
    writeFileSync(path.join(wavDir, "F-0011-a.wav"), forkWav({ frequencyHz: 440, seed: 11 }));
    writeFileSync(path.join(wavDir, "bench-take-2.wav"), forkWav({ frequencyHz: 440 * 2 ** (-20 / 1200), seed: 12 }));
    // A valid WAV of pure digital silence: accepted, then the analysis fails it with a reason.
    writeFileSync(path.join(wavDir, "forgot-to-strike.wav"), synthStrikeWav({ durationS: 1, partials: [], noise: 0, seed: 1 }));
  });

  afterAll(async () => {
    if (wavDir) rmSync(wavDir, { recursive: true, force: true });
  });

  it("the maker drops two recordings on BTW-2612 and sees where each went", async () => {
    const { page } = e2e.browser;
    await signIn(page, e2e.server.baseUrl, demo.maker);
    await openBatch(page, "BTW-2612");
    await ledgerRow(page, "F-0011").getByText("Not measured").waitFor();
    // A marker on this document: if the page reloaded, it would be gone.
    await page.evaluate(() => Object.assign(window, { __sameDocument: true }));

    await page.getByLabel("WAV files for the batch").setInputFiles([path.join(wavDir, "F-0011-a.wav"), path.join(wavDir, "bench-take-2.wav")]);
    const uploads = page.getByRole("list", { name: "Batch uploads" });
    // The named file goes to its unit; the other to the next unit with no strike yet.
    await uploads.getByRole("listitem").filter({ hasText: "F-0011-a.wav" }).getByText("(matched by file name)").waitFor();
    const second = uploads.getByRole("listitem").filter({ hasText: "bench-take-2.wav" });
    await second.getByText("(matched by next unmeasured unit)").waitFor();
    expect(await second.getByRole("link").textContent()).toBe("F-0012");
  });

  // Waits on the real analysis pool, which is slower when other test servers run at once.
  it("the ledger fills in without a reload: verdicts appear as the analyses finish", { timeout: 200_000 }, async () => {
    const { page } = e2e.browser;
    await ledgerRow(page, "F-0011").getByText("Within tolerance").waitFor({ timeout: 90_000 });
    await ledgerRow(page, "F-0012").getByText("Out of tolerance").waitFor({ timeout: 90_000 });
    // Same document throughout: the page polled, it was not reloaded.
    expect(await page.evaluate(() => (window as unknown as { __sameDocument?: boolean }).__sameDocument)).toBe(true);
    const deviation = await ledgerRow(page, "F-0012").getByRole("cell").nth(3).textContent();
    // −20 cents synthesised; the analysis is checked to a fraction of a cent elsewhere, here the sign and size matter.
    expect(deviation).toMatch(/^−(19|20|21)\.\d ¢$/);
    await page.getByRole("button", { name: /^Out of tolerance/ }).click();
    expect(await page.getByRole("table", { name: "Units of the batch" }).getByRole("row").count()).toBe(2); // header + F-0012
    await page.getByRole("button", { name: /^All units/ }).click();
    await screenshot(page, "e2e-ledger-btw-2612");
  });

  it("the unit out of tolerance shows its tuning guidance with the caution", async () => {
    const { page } = e2e.browser;
    await ledgerRow(page, "F-0012").getByRole("link", { name: "F-0012" }).click();
    await page.getByRole("heading", { name: "Unit F-0012", level: 1 }).waitFor();
    await page.getByRole("list", { name: "Strikes" }).getByText("Done").waitFor();
    await page.getByRole("heading", { name: "Tuning guidance" }).waitFor();
    await page.getByText(/^Raise the pitch by about (19|20|21)\.\d cents$/).waitFor();
    await page.getByRole("status").filter({ hasText: "Caution" }).waitFor();
    await screenshot(page, "e2e-unit-out-of-tolerance");

    // Each strike links to its own page (the visual analysis feature), inside the same shell.
    await page.getByRole("list", { name: "Strikes" }).getByRole("link", { name: "bench-take-2.wav" }).click();
    await page.getByRole("heading", { name: "Strike of F-0012", level: 1 }).waitFor();
    await page.getByRole("navigation", { name: "Main" }).waitFor();
    await page.goBack();
    await page.getByRole("heading", { name: "Unit F-0012", level: 1 }).waitFor();
  });

  it("the same file again on the same unit is recognised and refused with the server's words", async () => {
    const { page } = e2e.browser;
    await page.getByRole("link", { name: "← Batch BTW-2612" }).click();
    await ledgerRow(page, "F-0011").getByRole("link", { name: "F-0011" }).click();
    await page.getByRole("heading", { name: "Unit F-0011", level: 1 }).waitFor();
    await page.getByLabel("WAV recordings for this unit").setInputFiles(path.join(wavDir, "F-0011-a.wav"));
    const refused = page.getByRole("list", { name: "Uploads" }).getByRole("alert");
    await refused.waitFor();
    expect((await refused.textContent())?.toLowerCase()).toContain("already");
  });

  // Waits on the real analysis pool, which is slower when other test servers run at once.
  it("a recording with no strike in it fails its analysis, and the list says why in plain words", { timeout: 200_000 }, async () => {
    const { page } = e2e.browser;
    await page.getByLabel("WAV recordings for this unit").setInputFiles(path.join(wavDir, "forgot-to-strike.wav"));
    const item = page.getByRole("list", { name: "Strikes" }).getByRole("listitem").filter({ hasText: "forgot-to-strike.wav" });
    await item.getByText("Failed").waitFor({ timeout: 60_000 });
    const reason = await item.getByRole("alert").textContent();
    expect(reason).toMatch(/^Not analysed: \S.{10,}/);
    await screenshot(page, "e2e-unit-failed-strike");
  });

  // Waits on the real analysis pool, which is slower when other test servers run at once.
  it("qa sees F-0004 and F-0008 out of tolerance in BTW-2611, is refused a release while they are open", { timeout: 200_000 }, async () => {
    const { page } = e2e.browser;
    await page.getByRole("button", { name: "Sign out" }).click();
    await page.getByRole("heading", { name: "Sign in" }).waitFor();
    await signIn(page, e2e.server.baseUrl, demo.qa);
    await openBatch(page, "BTW-2611");
    const serials = Array.from({ length: 10 }, (_, i) => `F-${String(i + 1).padStart(4, "0")}`);
    await waitForVerdicts(page, serials);
    await page.getByRole("button", { name: /^Out of tolerance/ }).click();
    const table = page.getByRole("table", { name: "Units of the batch" });
    const shown = (await table.getByRole("row").allTextContents()).slice(1).map((t) => t.match(/F-\d{4}/)?.[0]);
    expect(shown.sort()).toEqual(["F-0004", "F-0008"]);

    await page.getByRole("button", { name: "Release batch…" }).click();
    await page.getByRole("button", { name: "Release BTW-2611 now" }).click();
    const refusal = page.getByRole("alert").filter({ hasText: "The batch was not released" });
    await refusal.waitFor();
    // The server's 409 lists the units still open.
    expect(await refusal.textContent()).toMatch(/F-0004/);
    await screenshot(page, "e2e-ledger-release-refused");
  });

  it("qa disposes of both and releases the batch", async () => {
    const { page } = e2e.browser;
    await dispose(page, "F-0004", "use_as_is", "Customer accepts −9 cents for a practice fork (demo concession).");
    await page.getByRole("link", { name: "← Batch BTW-2611" }).click();
    await dispose(page, "F-0008", "scrap", "Too sharp to rework within the tine length left.");
    await page.getByRole("link", { name: "← Batch BTW-2611" }).click();
    await page.getByRole("heading", { name: "Batch BTW-2611", level: 1 }).waitFor();
    await ledgerRow(page, "F-0008").getByText("Scrap").waitFor();
    await page.getByRole("button", { name: "Release batch…" }).click();
    await page.getByRole("button", { name: "Release BTW-2611 now" }).click();
    await page.getByRole("status").filter({ hasText: /^Released \d.*No more strikes can be added/ }).waitFor();
    await ledgerRow(page, "F-0004").getByText("Use as is (concession)").waitFor();
    expect(await page.getByRole("button", { name: "Measure next unit" }).count()).toBe(0);
    await screenshot(page, "e2e-ledger-released");
  });

  it("prints as a plain ledger: no navigation or controls, a header saying what and when", async () => {
    const { page } = e2e.browser;
    await page.emulateMedia({ media: "print" });
    try {
      expect(await page.getByRole("navigation", { name: "Main" }).isVisible()).toBe(false);
      expect(await page.getByRole("button", { name: "Print ledger" }).isVisible()).toBe(false);
      expect(await page.getByText(/batch ledger printed .* by /).isVisible()).toBe(true);
      expect(await page.getByRole("table", { name: "Units of the batch" }).isVisible()).toBe(true);
      await screenshot(page, "e2e-ledger-print");
    } finally {
      await page.emulateMedia({ media: null });
    }
  });
});
