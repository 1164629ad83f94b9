/**
 * Open sign-up: a new person creates an account, then their workshop (becoming its owner), then a
 * second one, and switches between them; each switch shows the chosen workshop's name and role.
 */
import { describe, expect, it } from "vitest";
import { screenshot } from "../support/browser";
import { withServerAndBrowser } from "../support/e2e";

describe("signing up and creating workshops", () => {
  const e2e = withServerAndBrowser();

  it("creates an account and is led to create a workshop", async () => {
    const { page } = e2e.browser;
    await page.goto(`${e2e.server.baseUrl}/sign-in`);
    await page.getByRole("link", { name: "Create an account" }).click();
    const form = page.getByRole("form", { name: "Create an account" });
    await form.getByLabel("Your name").fill("Rhea Castellan");
    await form.getByLabel("E-mail").fill("rhea@example.com");
    await form.getByLabel("Password").fill("bench-and-anvil-42");
    await form.getByRole("button", { name: "Create account" }).click();
    await page.getByRole("heading", { name: "Create your workshop" }).waitFor();
    await screenshot(page, "e2e-create-workshop");
  });

  it("derives the short name from the workshop name and becomes its owner", async () => {
    const { page } = e2e.browser;
    const form = page.getByRole("form", { name: "Create your workshop" });
    await form.getByLabel("Workshop name").fill("Saltmarsh Bell Foundry");
    expect(await form.getByLabel("Short name").inputValue()).toBe("saltmarsh-bell-foundry");
    await form.getByRole("button", { name: "Create workshop" }).click();
    await page.getByText("Saltmarsh Bell Foundry · you work here as Owner.").waitFor();
    await page.getByRole("navigation", { name: "Main" }).getByRole("link", { name: "Members" }).waitFor();
  });

  it("refuses a short name another workshop already uses, in place", async () => {
    const { page } = e2e.browser;
    await page.getByRole("link", { name: "New workshop…" }).click();
    const form = page.getByRole("form", { name: "Create your workshop" });
    await form.getByLabel("Workshop name").fill("Saltmarsh Bell Foundry");
    await form.getByRole("button", { name: "Create workshop" }).click();
    await form.getByText("Another workshop already uses this short name").waitFor();
    await screenshot(page, "e2e-create-workshop-slug-taken");
  });

  it("switches between two workshops", async () => {
    const { page } = e2e.browser;
    const form = page.getByRole("form", { name: "Create your workshop" });
    await form.getByLabel("Workshop name").fill("Saltmarsh Chimes");
    await form.getByLabel("Short name").fill("saltmarsh-chimes");
    await form.getByRole("button", { name: "Create workshop" }).click();
    await page.getByText("Saltmarsh Chimes · you work here as Owner.").waitFor();

    const switcher = page.getByLabel("Switch workshop");
    const options = await switcher.locator("option").allTextContents();
    expect(options.sort()).toEqual(["Saltmarsh Bell Foundry", "Saltmarsh Chimes"]);
    await switcher.selectOption({ label: "Saltmarsh Bell Foundry" });
    await page.getByText("Saltmarsh Bell Foundry · you work here as Owner.").waitFor();
    await screenshot(page, "e2e-switched-workshop");

    // The members list follows the active workshop: only its creator is in it.
    await page.getByRole("navigation", { name: "Main" }).getByRole("link", { name: "Members" }).click();
    const members = page.getByRole("list", { name: "Members" });
    await members.getByText("rhea@example.com").waitFor();
    expect(await members.getByRole("listitem").count()).toBe(1);
  });
});
