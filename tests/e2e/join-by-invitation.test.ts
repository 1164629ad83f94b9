/**
 * The whole invitation path as two people live it: the owner invites an address, the invitee opens
 * the link from the e-mail (read from the outbox, as captured over SMTP), creates an account,
 * confirms the address through the mailed link, which brings them back to the invitation, joins,
 * and lands on the dashboard with the role the owner chose.
 */
import { describe, expect, it } from "vitest";
import { demo, screenshot, signIn } from "../support/browser";
import { withServerAndBrowser } from "../support/e2e";
import { linkIn, waitForMail } from "../support/mail";

describe("joining a workshop by invitation", () => {
  const e2e = withServerAndBrowser({ viewport: { width: 820, height: 1180 } }); // tablet, portrait
  const invitee = "quality.lead@example.com";
  let inviteLink = "";

  it("the owner invites a QA member and copies the link from the mail", async () => {
    const { page } = e2e.browser;
    await signIn(page, e2e.server.baseUrl, demo.owner);
    await page.goto(`${e2e.server.baseUrl}/app/members`);
    const form = page.getByRole("form", { name: "Invite a member" });
    await form.getByLabel("E-mail address").fill(invitee);
    await form.getByLabel("Role").selectOption("qa");
    await form.getByRole("button", { name: "Send invitation" }).click();
    await form.getByText(`Invitation sent to ${invitee}`).waitFor();
    await screenshot(page, "e2e-portrait-members");

    await page.goto(`${e2e.server.baseUrl}/app/outbox`);
    await page.getByRole("list", { name: "Sent mail" }).getByRole("link").filter({ hasText: `To ${invitee}` }).click();
    const text = (await page.getByRole("article").locator("pre").textContent()) ?? "";
    inviteLink = text.match(/https?:\/\/\S+\/invite\/\S+/)?.[0] ?? "";
    expect(inviteLink).not.toBe("");

    // The HTML part is shown sandboxed and carries the same link.
    await page.getByRole("button", { name: "Formatted (HTML)" }).click();
    const frame = page.frameLocator('iframe[title="Formatted message"]');
    const href = await frame.getByRole("link").first().getAttribute("href");
    expect(href).toBe(inviteLink);
    await screenshot(page, "e2e-portrait-outbox-html");

    await page.getByRole("button", { name: "Sign out" }).click();
    await page.getByRole("heading", { name: "Sign in" }).waitFor();
  });

  it("the invitee sees the workshop and role only, signs up, confirms the address through the mail, and joins", async () => {
    const { page } = e2e.browser;
    await page.goto(inviteLink);
    await page.getByRole("heading", { name: `Join ${demo.workshopName}` }).waitFor();
    await page.getByText("You are invited to work in this workshop as Quality.").waitFor();
    // The landing keeps the invited address and the inviter private (the link may have been forwarded).
    expect(await page.getByText(invitee).count()).toBe(0);
    expect(await page.getByText("Mara Ellison").count()).toBe(0);
    await screenshot(page, "e2e-invitation-landing");

    const signUp = page.getByRole("form", { name: "Create an account" });
    await signUp.getByLabel("Your name").fill("Petra Quill");
    await signUp.getByLabel("E-mail").fill(invitee);
    await signUp.getByLabel("Password").fill("short");
    await signUp.getByRole("button", { name: "Create account" }).click();
    await signUp.getByText("Use at least 10 characters.").waitFor();

    await signUp.getByLabel("Password").fill("a-long-enough-password");
    await signUp.getByRole("button", { name: "Create account" }).click();
    await page.getByRole("heading", { name: "Check your mail" }).waitFor();

    const mail = await waitForMail({ dataDir: e2e.server.dataDir }, invitee, /confirm/i);
    await page.goto(linkIn(mail.text, "/api/auth/verify-email"));
    await page.getByRole("heading", { name: `Join ${demo.workshopName}` }).waitFor();
    await page.getByRole("button", { name: `Join ${demo.workshopName}` }).click();

    await page.getByRole("heading", { name: "Dashboard", level: 1 }).waitFor();
    await page.getByText(`${demo.workshopName} · you work here as Quality.`).waitFor();
    const links = (await page.getByRole("navigation", { name: "Main" }).getByRole("link").allTextContents()).map((t) => t.replace(/soon$/, "").trim());
    // Quality reads the certificate mail it sends, so the Outbox is there too (not Members or Settings).
    expect(links).toEqual(["Dashboard", "Batches", "Specifications", "Instruments", "Outbox"]);
    await screenshot(page, "e2e-portrait-qa-dashboard");
  });

  it("an accepted invitation shows nothing any more", async () => {
    const { page } = e2e.browser;
    await page.goto(inviteLink);
    await page.getByRole("heading", { name: "This invitation is not open any more" }).waitFor();
    await page.getByText("If you joined already, sign in.").waitFor();
  });

  it("an unknown invitation says plainly that it was not found", async () => {
    const { page } = e2e.browser;
    await page.goto(`${e2e.server.baseUrl}/invite/no-such-invitation`);
    await page.getByRole("heading", { name: "This invitation is not open any more" }).waitFor();
    await page.getByText("ask the workshop owner to send a new invitation").waitFor();
    await screenshot(page, "e2e-invitation-not-found");
  });

  it("someone who already has an account (in another workshop) signs in on the landing, joins, and can switch", async () => {
    const { page } = e2e.browser;
    // The owner invites the other workshop's owner as a maker.
    await page.goto(`${e2e.server.baseUrl}/app`);
    await page.getByRole("button", { name: "Sign out" }).click();
    await page.getByRole("heading", { name: "Sign in" }).waitFor();
    await signIn(page, e2e.server.baseUrl, demo.owner);
    await page.goto(`${e2e.server.baseUrl}/app/members`);
    const form = page.getByRole("form", { name: "Invite a member" });
    await form.getByLabel("E-mail address").fill(demo.other);
    await form.getByLabel("Role").selectOption("maker");
    await form.getByRole("button", { name: "Send invitation" }).click();
    await form.getByText(`Invitation sent to ${demo.other}`).waitFor();
    await page.goto(`${e2e.server.baseUrl}/app/outbox`);
    await page.getByRole("list", { name: "Sent mail" }).getByRole("link").filter({ hasText: `To ${demo.other}` }).click();
    const text = (await page.getByRole("article").locator("pre").textContent()) ?? "";
    const link = text.match(/https?:\/\/\S+\/invite\/\S+/)?.[0] ?? "";
    expect(link).not.toBe("");
    await page.getByRole("button", { name: "Sign out" }).click();
    await page.getByRole("heading", { name: "Sign in" }).waitFor();

    await page.goto(link);
    await page.getByRole("button", { name: "Have an account" }).click();
    const signInForm = page.getByRole("form", { name: "Sign in" });
    await signInForm.getByLabel("E-mail").fill(demo.other);
    await signInForm.getByLabel("Password").fill(demo.password);
    await signInForm.getByRole("button", { name: "Sign in" }).click();
    await page.getByRole("button", { name: `Join ${demo.workshopName}` }).click();
    await page.getByText(`${demo.workshopName} · you work here as Maker.`).waitFor();

    const switcher = page.getByLabel("Switch workshop");
    expect((await switcher.locator("option").allTextContents()).sort()).toEqual([demo.workshopName, demo.otherWorkshopName].sort());
    await switcher.selectOption({ label: demo.otherWorkshopName });
    await page.getByText(`${demo.otherWorkshopName} · you work here as Owner.`).waitFor();
    await page.getByRole("navigation", { name: "Main" }).getByRole("link", { name: "Members" }).waitFor();
    await screenshot(page, "e2e-portrait-switched-to-own-workshop");
  });
});
