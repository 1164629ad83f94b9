/**
 * The set-up screens in a real browser: qa writes a specification from a family template (errors
 * in place, including inside a partial row), edits it into a new version with a change note, and
 * creates a batch whose serial range is counted before sending; the owner completes the workshop
 * profile; the dashboard shows the open batches.
 */
import { describe, expect, it } from "vitest";
import { demo, screenshot, signIn, signInThroughForm } from "../support/browser";
import { withServerAndBrowser } from "../support/e2e";

describe("specifications, a new batch and the workshop settings", () => {
  const e2e = withServerAndBrowser();

  it("qa sees the open batches on the dashboard", { timeout: 200_000 }, async () => {
    const { page } = e2e.browser;
    await signIn(page, e2e.server.baseUrl, demo.qa);
    const open = page.getByRole("list", { name: "Open batches" });
    await open.getByRole("link", { name: "BTW-2611" }).waitFor();
    await open.getByRole("link", { name: "BTW-2612" }).waitFor();
    await page.getByRole("heading", { name: "Awaiting review" }).waitFor();
    // The seeded strikes are analysed at start; the queue lists the two forks out of tolerance.
    const queue = page.getByRole("list", { name: "Units awaiting review" });
    await queue.getByRole("link", { name: "F-0004" }).waitFor({ timeout: 90_000 });
    await queue.getByRole("link", { name: "F-0008" }).waitFor({ timeout: 90_000 });
    await screenshot(page, "e2e-dashboard-qa");
  });

  it("qa starts a free-bar specification from its template and is told what is wrong in place", async () => {
    const { page } = e2e.browser;
    await page.getByRole("navigation", { name: "Main" }).getByRole("link", { name: "Specifications" }).click();
    await page.getByRole("link", { name: "New specification" }).click();
    await page.getByRole("heading", { name: "New specification", level: 1 }).waitFor();
    await page.getByLabel("Product family").selectOption("free_bar");
    await page.getByRole("heading", { name: /^Template: Free bar/ }).waitFor();
    // The template's own words, with its sources (shared/spec-templates.ts).
    await page.getByText(/Euler–Bernoulli beam theory/).first().waitFor();
    const second = page.getByRole("group", { name: "Partial 2" });
    expect(await second.getByLabel("Ratio (× fundamental)").inputValue()).toBe("2.757");

    await page.getByLabel("Name").fill("Chime bar C6, aluminium");
    await second.getByLabel("Tolerance (± cents)").fill("0");
    await page.getByRole("group", { name: "Partial 3" }).getByLabel("Label").fill("2nd mode");
    await page.getByRole("button", { name: "Create specification" }).click();
    await second.getByText("Tolerance must be greater than 0").waitFor();
    await page.getByRole("group", { name: "Partial 3" }).getByText('Label "2nd mode" is used twice').waitFor();
    await screenshot(page, "e2e-spec-editor-errors");

    await second.getByLabel("Tolerance (± cents)").fill("40");
    await page.getByRole("group", { name: "Partial 3" }).getByLabel("Label").fill("3rd mode");
    await page.getByRole("group", { name: "Partial 1" }).getByLabel("Target (Hz)").fill("1046.5");
    await page.getByRole("button", { name: "Create specification" }).click();
    await page.getByRole("heading", { name: "Chime bar C6, aluminium", level: 1 }).waitFor();
    await page.getByRole("heading", { name: /^Version 1/ }).waitFor();
  });

  it("qa edits it into version 2 with a change note; both versions stay", async () => {
    const { page } = e2e.browser;
    await page.getByRole("link", { name: "Edit (new version)" }).click();
    await page.getByRole("heading", { name: "Edit Chime bar C6, aluminium", level: 1 }).waitFor();
    await page.getByRole("group", { name: "Partial 1" }).getByLabel("Tolerance (± cents)").fill("3");
    await page.getByRole("button", { name: "Save as version 2" }).click();
    await page.getByText("Say what changed and why").waitFor();
    await page.getByLabel("Change note").fill("Customer asks for ±3 cents on the fundamental.");
    await page.getByRole("button", { name: "Save as version 2" }).click();
    const versions = page.getByRole("list", { name: "Versions" });
    await versions.getByRole("heading", { name: /^Version 2/ }).waitFor();
    await versions.getByRole("heading", { name: /^Version 1/ }).waitFor();
    await versions.getByText("“Customer asks for ±3 cents on the fundamental.”").waitFor();
    await screenshot(page, "e2e-spec-versions");
  });

  it("qa creates a batch and sees the range counted before sending", async () => {
    const { page } = e2e.browser;
    await page.getByRole("navigation", { name: "Main" }).getByRole("link", { name: "Batches" }).click();
    await page.getByRole("link", { name: "New batch" }).click();
    const form = page.getByRole("form", { name: "New batch" });
    await form.getByLabel("Batch code").fill("CB-0001");
    await form.getByLabel("Specification").selectOption({ label: "Chime bar C6, aluminium (version 2)" });
    await form.getByLabel("Quantity (units)").fill("120");
    await form.getByLabel("First serial").fill("F-0101");
    await form.getByLabel("Last serial").fill("F-220");
    await form.getByText(/zero-padded to different widths/).waitFor();
    await form.getByLabel("Last serial").fill("F-0220");
    await form.getByText("F-0101 … F-0220: 120 serials, matching the quantity.").waitFor();
    await form.getByRole("button", { name: "Create batch" }).click();
    await page.getByRole("heading", { name: "Batch CB-0001", level: 1 }).waitFor();
    await page.getByText("0 / 120").waitFor();
  });

  it("the owner completes the workshop profile", async () => {
    const { page } = e2e.browser;
    await page.getByRole("button", { name: "Sign out" }).click();
    await page.getByRole("heading", { name: "Sign in" }).waitFor();
    await signInThroughForm(page, e2e.server.baseUrl, demo.owner);
    await page.getByRole("navigation", { name: "Main" }).getByRole("link", { name: "Settings" }).click();
    await page.getByRole("heading", { name: "Workshop settings", level: 1 }).waitFor();
    const form = page.getByRole("form", { name: "Workshop profile" });
    await form.getByLabel("Certificate prefix").fill("btw 1");
    await form.getByRole("button", { name: "Save profile" }).click();
    await form.getByText("Capital letters, digits and - only").waitFor();
    await form.getByLabel("Certificate prefix").fill("BTW-Q");
    await form.getByRole("button", { name: "Save profile" }).click();
    await form.getByText("Profile saved.").waitFor();
    await page.reload();
    expect(await page.getByLabel("Certificate prefix").inputValue()).toBe("BTW-Q");
    await screenshot(page, "e2e-settings");
  });
});
