/**
 * Open sign-up: a new person creates an account, confirms the address through the mailed link (read
 * from the SMTP capture), creates their workshop (becoming its owner), then a second one, and
 * switches between them; each switch shows the chosen workshop's name and role. A forgotten
 * password is reset by e-mail.
 */
import { describe, expect, it } from "vitest";
import { screenshot } from "../support/browser";
import { withServerAndBrowser } from "../support/e2e";
import { linkIn, waitForMail } from "../support/mail";

describe("signing up and creating workshops", () => {
  const e2e = withServerAndBrowser();

  it("creates an account, is asked to check the mail, and confirms through the link to create a workshop", async () => {
    const { page } = e2e.browser;
    await page.goto(`${e2e.server.baseUrl}/sign-in`);
    await page.getByRole("link", { name: "Create an account" }).click();
    const form = page.getByRole("form", { name: "Create an account" });
    await form.getByLabel("Your name").fill("Rhea Castellan");
    await form.getByLabel("E-mail").fill("rhea@example.com");
    await form.getByLabel("Password").fill("password123");
    await form.getByRole("button", { name: "Create account" }).click();
    await form.getByText("most common passwords").waitFor();
    await form.getByLabel("Password").fill("bench-and-anvil-42");
    await form.getByRole("button", { name: "Create account" }).click();
    await page.getByRole("heading", { name: "Check your mail" }).waitFor();
    await page.getByText("rhea@example.com").waitFor();
    await screenshot(page, "e2e-check-your-mail");

    // Not confirmed yet: signing in is refused with a plain word and a fresh link.
    await page.getByRole("link", { name: "Sign in" }).click();
    await page.getByLabel("E-mail").fill("rhea@example.com");
    await page.getByLabel("Password").fill("bench-and-anvil-42");
    await page.getByRole("button", { name: "Sign in" }).click();
    await page.getByText("Confirm your e-mail address first").waitFor();

    const mail = await waitForMail({ dataDir: e2e.server.dataDir }, "rhea@example.com", /confirm/i);
    await page.goto(linkIn(mail.text, "/api/auth/verify-email"));
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

  it("resets a forgotten password by e-mail and signs in with the new one", async () => {
    const { page } = e2e.browser;
    await page.getByRole("button", { name: "Sign out" }).click();
    await page.getByRole("heading", { name: "Sign in" }).waitFor();
    await page.getByRole("link", { name: "Forgot your password?" }).click();
    const form = page.getByRole("form", { name: "Reset your password" });
    await form.getByLabel("E-mail").fill("rhea@example.com");
    await form.getByRole("button", { name: "Send the link" }).click();
    await page.getByText("If rhea@example.com has a Tinelog account").waitFor();
    await screenshot(page, "e2e-forgot-password");

    const mail = await waitForMail({ dataDir: e2e.server.dataDir }, "rhea@example.com", /new .*password/i);
    await page.goto(linkIn(mail.text, "/api/auth/reset-password/"));
    const reset = page.getByRole("form", { name: "Choose a new password" });
    await reset.getByLabel("New password").fill("forge-and-file-77");
    await reset.getByLabel("The same again").fill("forge-and-file-78");
    await reset.getByRole("button", { name: "Save the new password" }).click();
    await reset.getByText("The two passwords differ").waitFor();
    await reset.getByLabel("The same again").fill("forge-and-file-77");
    await screenshot(page, "e2e-reset-password");
    await reset.getByRole("button", { name: "Save the new password" }).click();
    await page.getByText("Your password is changed").waitFor();
    await page.getByRole("link", { name: "Sign in with the new password" }).click();
    await page.getByLabel("E-mail").fill("rhea@example.com");
    await page.getByLabel("Password").fill("forge-and-file-77");
    await page.getByRole("button", { name: "Sign in" }).click();
    await page.getByRole("heading", { name: "Dashboard", level: 1 }).waitFor();
  });
});
