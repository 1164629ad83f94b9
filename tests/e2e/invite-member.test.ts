/**
 * The demo owner invites a new member from the Members screen; the invitation is sent over real
 * SMTP to the server's capture server and shows up in the Outbox, where it can be opened and read.
 */
import { describe, expect, it } from "vitest";
import { demo, fillSignInForm, screenshot, signIn } from "../support/browser";
import { withServerAndBrowser } from "../support/e2e";

describe("an owner invites a member and finds the mail in the outbox", () => {
  const e2e = withServerAndBrowser();
  const invitee = "new.maker@example.com";

  it("signs in as the owner and sees Members and Outbox in the navigation", async () => {
    const { page } = e2e.browser;
    await signIn(page, e2e.server.baseUrl, demo.owner);
    const nav = page.getByRole("navigation", { name: "Main" });
    await nav.getByRole("link", { name: "Members" }).waitFor();
    await nav.getByRole("link", { name: "Outbox" }).waitFor();
    await screenshot(page, "e2e-owner-dashboard");
  });

  it("rejects a malformed address in place, then sends the invitation", async () => {
    const { page } = e2e.browser;
    await page.getByRole("navigation", { name: "Main" }).getByRole("link", { name: "Members" }).click();
    await page.getByRole("heading", { name: "Members", level: 1 }).waitFor();
    await page.getByRole("list", { name: "Members" }).getByText("maker@example.com").waitFor();

    const form = page.getByRole("form", { name: "Invite a member" });
    await form.getByLabel("E-mail address").fill("not-an-address");
    await form.getByRole("button", { name: "Send invitation" }).click();
    await form.getByText("This is not an e-mail address").waitFor();
    await screenshot(page, "e2e-members-field-error");

    await form.getByLabel("E-mail address").fill(invitee);
    await form.getByLabel("Role").selectOption("maker");
    await form.getByRole("button", { name: "Send invitation" }).click();
    await form.getByText(`Invitation sent to ${invitee}`).waitFor();
    await page.getByRole("list", { name: "Pending invitations" }).getByText(invitee).waitFor();
    await screenshot(page, "e2e-members-invited");
  });

  it("lists the invitation mail in the outbox and opens it", async () => {
    const { page } = e2e.browser;
    await page.getByRole("navigation", { name: "Main" }).getByRole("link", { name: "Outbox" }).click();
    await page.getByRole("heading", { name: "Outbox", level: 1 }).waitFor();
    const sent = page.getByRole("list", { name: "Sent mail" });
    const item = sent.getByRole("link").filter({ hasText: `To ${invitee}` });
    await item.waitFor();
    await screenshot(page, "e2e-outbox");

    await item.click();
    const article = page.getByRole("article");
    await article.getByText(invitee).first().waitFor();
    // The mail carries the invitation link to the public landing page.
    const body = await article.locator("pre").textContent();
    expect(body).toMatch(new RegExp(`${e2e.server.baseUrl.replace(/[.:/]/g, "\\$&")}/invite/[^\\s]+`));
    await screenshot(page, "e2e-outbox-message");
  });

  it("cancels the pending invitation, changes a role and removes a member, and the server keeps it", async () => {
    const { page } = e2e.browser;
    await page.getByRole("navigation", { name: "Main" }).getByRole("link", { name: "Members" }).click();
    const pending = page.getByRole("list", { name: "Pending invitations" });
    await pending.getByText(invitee).waitFor();
    await page.getByRole("button", { name: `Cancel the invitation to ${invitee}` }).click();
    await page.getByText("No invitations waiting").waitFor();

    await page.getByLabel("Role of Ilse Varga").selectOption("qa");
    await page.getByRole("button", { name: "Remove Tobias Renn from the workshop" }).click();
    await page.getByRole("button", { name: "Remove Tobias Renn", exact: true }).click();
    await page.getByRole("list", { name: "Members" }).getByText("qa@example.com").waitFor({ state: "detached" });
    await screenshot(page, "e2e-members-managed");

    // A full reload reads everything back from the server, not from the client's cache.
    await page.reload();
    const members = page.getByRole("list", { name: "Members" });
    await members.getByText("maker@example.com").waitFor();
    expect(await page.getByLabel("Role of Ilse Varga").inputValue()).toBe("qa");
    expect(await members.getByText("qa@example.com").count()).toBe(0);
    expect(await page.getByText("No invitations waiting").count()).toBe(1);
  });

  it("a session that ended elsewhere leads back to sign-in, and back here afterwards", async () => {
    const { page, context } = e2e.browser;
    await context.clearCookies();
    const form = page.getByRole("form", { name: "Invite a member" });
    await form.getByLabel("E-mail address").fill("late@example.com");
    await form.getByRole("button", { name: "Send invitation" }).click();
    await page.getByRole("heading", { name: "Sign in" }).waitFor();
    expect(new URL(page.url()).searchParams.get("redirectTo")).toBe("/app/members");

    await fillSignInForm(page, demo.owner);
    await page.getByRole("heading", { name: "Members", level: 1 }).waitFor();
  });
});
