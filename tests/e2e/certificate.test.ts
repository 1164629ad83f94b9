/**
 * Certificates in a real browser: qa releases the seeded batch BTW-2611,
 * previews and issues a certificate for a unit within tolerance; the owner finds the e-mail with
 * its PDF in the outbox, the PDF is downloaded and page 1 rendered with poppler's pdftoppm (a
 * person looks at the PNG in .tmp/); the verification link opens signed out, at phone width.
 */
import { execFileSync } from "node:child_process";
import { existsSync, mkdirSync, readFileSync, statSync } from "node:fs";
import path from "node:path";
import { afterAll, describe, expect, it } from "vitest";
import { demo, launchBrowser, screenshot, screenshotDir, signIn, type LaunchedBrowser } from "../support/browser";
import { withServerAndBrowser } from "../support/e2e";
import { disposeAndRelease, ledgerRow, openBatch, waitForVerdicts } from "./ledger-steps";

const recipient = { email: "m.testcustomer@example.org", name: "Morgan Testcustomer" };

describe("a certificate: issued by qa, mailed with its PDF, verified signed out", () => {
  const e2e = withServerAndBrowser();
  let phone: LaunchedBrowser | undefined;
  let verifyUrl = "";
  let certificateNumber = "";

  afterAll(async () => {
    await phone?.close();
  });

  // Waits on the real analysis pool, which is slower when other test servers run at once.
  it("qa is told certificates wait for the release, then disposes and releases BTW-2611", { timeout: 200_000 }, async () => {
    const { page } = e2e.browser;
    await signIn(page, e2e.server.baseUrl, demo.qa);
    await openBatch(page, "BTW-2611");
    await waitForVerdicts(page, Array.from({ length: 10 }, (_, i) => `F-${String(i + 1).padStart(4, "0")}`));

    await ledgerRow(page, "F-0001").getByRole("link", { name: "F-0001" }).click();
    await page.getByRole("heading", { name: "Unit F-0001", level: 1 }).waitFor();
    await page.getByText("Certificates are issued once batch BTW-2611 is released").waitFor();
    await page.getByRole("link", { name: "← Batch BTW-2611" }).click();
    await page.getByRole("heading", { name: "Batch BTW-2611", level: 1 }).waitFor();

    await disposeAndRelease(page);
  });

  it("qa previews, then issues a certificate for F-0001 (within tolerance)", async () => {
    const { page } = e2e.browser;
    await ledgerRow(page, "F-0001").getByText("Within tolerance").waitFor();
    await ledgerRow(page, "F-0001").getByRole("link", { name: "F-0001" }).click();
    await page.getByRole("heading", { name: "Unit F-0001", level: 1 }).waitFor();

    const form = page.getByRole("form", { name: "Issue a certificate" });
    await form.getByLabel("Recipient e-mail").fill("not an address");
    await form.getByRole("button", { name: "Issue", exact: true }).click();
    await form.getByText("This is not an e-mail address").waitFor();

    await form.getByLabel("Recipient e-mail").fill(recipient.email);
    await form.getByLabel("Recipient name").fill(recipient.name);
    await form.getByRole("button", { name: "Preview" }).click();
    const preview = form.locator('iframe[title="Certificate preview"]');
    await preview.waitFor();
    expect(await preview.getAttribute("src")).toMatch(/^blob:/);
    await screenshot(page, "e2e-certificate-preview");

    await form.getByRole("button", { name: "Issue", exact: true }).click();
    const issued = page.getByRole("status").filter({ hasText: /Certificate .+ issued/ });
    await issued.waitFor();
    certificateNumber = ((await issued.textContent()) ?? "").match(/Certificate (\S+) issued/)?.[1] ?? "";
    expect(certificateNumber).toMatch(/^BTW-/);

    const item = page.getByRole("list", { name: "Certificates" }).getByRole("listitem").filter({ hasText: certificateNumber });
    await item.getByText("Current").waitFor();
    await item.getByText(/^E-mail sent/).waitFor({ timeout: 30_000 });
    verifyUrl = (await item.getByRole("link", { name: "Verification page" }).getAttribute("href")) ?? "";
    expect(verifyUrl).toMatch(/\/verify\/[A-Za-z0-9_-]{22,}$/);
    await screenshot(page, "e2e-certificate-issued");
  });

  it("the owner finds the mail in the outbox; its PDF attachment renders", async () => {
    const { page } = e2e.browser;
    await page.getByRole("button", { name: "Sign out" }).click();
    await page.getByRole("heading", { name: "Sign in" }).waitFor();
    await signIn(page, e2e.server.baseUrl, demo.owner);
    await page.getByRole("navigation", { name: "Main" }).getByRole("link", { name: "Outbox" }).click();
    await page.getByRole("list", { name: "Sent mail" }).getByRole("link").filter({ hasText: `To ${recipient.email}` }).click();
    await page.getByRole("heading", { name: "Attachments" }).waitFor();

    const download = page.waitForEvent("download");
    await page.getByRole("link", { name: "Download" }).first().click();
    const file = await download;
    mkdirSync(screenshotDir, { recursive: true });
    const pdf = path.join(screenshotDir, "e2e-certificate.pdf");
    await file.saveAs(pdf);
    expect(readFileSync(pdf).subarray(0, 5).toString("latin1")).toBe("%PDF-");
    expect(file.suggestedFilename()).toBe(`${certificateNumber}.pdf`);

    // poppler-utils (Debian): page 1 at 60 dpi, for a person to look at.
    const prefix = path.join(screenshotDir, "e2e-certificate-page");
    execFileSync("pdftoppm", ["-png", "-r", "60", "-f", "1", "-l", "1", "-singlefile", pdf, prefix]);
    expect(existsSync(`${prefix}.png`)).toBe(true);
    expect(statSync(`${prefix}.png`).size).toBeGreaterThan(10_000);
    await screenshot(page, "e2e-certificate-outbox");
  });

  it("the verification link opens signed out on a phone and says the signature verified", async () => {
    phone = await launchBrowser({ viewport: { width: 390, height: 844 } });
    const page = phone.page;
    await page.goto(verifyUrl);
    await page.getByRole("heading", { name: certificateNumber, level: 1 }).waitFor();
    await page.getByRole("status").filter({ hasText: "Signature verified" }).waitFor();
    await page.getByText("F-0001", { exact: true }).waitFor();
    await page.getByText("Within tolerance").first().waitFor();
    const text = (await page.textContent("body")) ?? "";
    expect(text).not.toContain(recipient.email);
    expect(text).not.toContain(recipient.name);
    // Nothing wider than the phone: no sideways scrolling.
    expect(await page.evaluate(() => document.documentElement.scrollWidth)).toBeLessThanOrEqual(390);
    await screenshot(page, "e2e-verify-phone");
  });

  it("the owner amends it: a new number, the earlier one marked superseded there and on its verification page", async () => {
    const { page } = e2e.browser;
    await page.getByRole("navigation", { name: "Main" }).getByRole("link", { name: "Batches" }).click();
    await page.getByRole("link", { name: "BTW-2611", exact: true }).click();
    await ledgerRow(page, "F-0001").getByRole("link", { name: "F-0001" }).click();
    await page.getByRole("heading", { name: "Unit F-0001", level: 1 }).waitFor();
    const list = page.getByRole("list", { name: "Certificates" });
    const first = list.getByRole("listitem").filter({ hasText: certificateNumber });
    await first.getByRole("button", { name: "Amend…" }).click();
    const form = page.getByRole("form", { name: `Amend certificate ${certificateNumber}` });
    await form.getByRole("button", { name: "Issue amendment" }).click();
    await form.getByText("Say in a few words why the certificate is amended.").waitFor();
    await form.getByLabel("Reason for the amendment").fill("Recipient's name was misspelt.");
    await form.getByLabel("Recipient name").fill("Morgan Test-Customer");
    await form.getByRole("button", { name: "Issue amendment" }).click();
    await first.getByText(/^Superseded by /).waitFor();
    const amendment = list.getByRole("listitem").filter({ hasText: `amends ${certificateNumber}` });
    await amendment.getByText("Current").waitFor();
    await screenshot(page, "e2e-certificate-amended");

    const old = phone!.page;
    await old.reload();
    await old.getByRole("status").filter({ hasText: /^Superseded/ }).waitFor();
    await old.getByRole("status").filter({ hasText: "Signature verified" }).waitFor();
  });
});
