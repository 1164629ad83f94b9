/**
 * The demo maker signs in through the real form and reaches the dashboard of the demo workshop,
 * seeing only what a maker may use (shared/permissions.ts: no Members, no Outbox).
 */
import { describe, expect, it } from "vitest";
import { demo, screenshot, signIn, signInThroughForm } from "../support/browser";
import { withServerAndBrowser } from "../support/e2e";

describe("signing in as the demo maker", () => {
  const e2e = withServerAndBrowser();

  it("sends a signed-out visitor to the sign-in page", async () => {
    const { page } = e2e.browser;
    await page.goto(`${e2e.server.baseUrl}/app/members`);
    await page.getByRole("heading", { name: "Sign in" }).waitFor();
    expect(new URL(page.url()).pathname).toBe("/sign-in");
    expect(new URL(page.url()).searchParams.get("redirectTo")).toBe("/app/members");
    await screenshot(page, "e2e-sign-in");
  });

  it("says plainly when the password is wrong", async () => {
    const { page } = e2e.browser;
    await signInThroughForm(page, e2e.server.baseUrl, demo.maker, "not-the-password");
    const alert = page.getByRole("alert");
    await alert.waitFor();
    expect((await alert.textContent())?.trim().length).toBeGreaterThan(0);
    expect(new URL(page.url()).pathname).toBe("/sign-in");
    await screenshot(page, "e2e-sign-in-wrong-password");
  });

  it("shows the dashboard with the maker's navigation", async () => {
    const { page } = e2e.browser;
    await signIn(page, e2e.server.baseUrl, demo.maker);
    await page.getByText(`${demo.workshopName} · you work here as Maker.`).waitFor();

    const nav = page.getByRole("navigation", { name: "Main" });
    const links = (await nav.getByRole("link").allTextContents()).map((text) => text.replace(/soon$/, "").trim());
    expect(links).toEqual(["Dashboard", "Batches", "Specifications", "Instruments"]);
    await screenshot(page, "e2e-maker-dashboard");
  });

  it("lists the demo workshop's batches, and no specification editor for a maker", async () => {
    const { page } = e2e.browser;
    await page.getByRole("navigation", { name: "Main" }).getByRole("link", { name: /^Batches/ }).click();
    await page.getByRole("heading", { name: "Batches", level: 1 }).waitFor();
    const table = page.getByRole("table", { name: "Batches" });
    await table.getByRole("link", { name: "BTW-2611" }).waitFor();
    await table.getByRole("link", { name: "BTW-2612" }).waitFor();
    await page.getByRole("link", { name: "New batch" }).waitFor();
    await page.getByRole("navigation", { name: "Main" }).getByRole("link", { name: "Specifications" }).click();
    await page.getByRole("heading", { name: "Specifications", level: 1 }).waitFor();
    await page.getByRole("link", { name: "BTW-440 concert fork, steel" }).waitFor();
    expect(await page.getByRole("link", { name: "New specification" }).count()).toBe(0);
    await screenshot(page, "e2e-maker-batches");
  });

  it("answers a page the maker may not use with a plain 403 message", async () => {
    const { page } = e2e.browser;
    await page.goto(`${e2e.server.baseUrl}/app/members`);
    await page.getByRole("heading", { name: "Not available for your role" }).waitFor();
    await screenshot(page, "e2e-maker-forbidden");
  });
});
