/** Texts of the e-mails Tinelog sends. Plain-text first; the HTML part says the same. */
import { roleLabels, type RoleName } from "../../shared/permissions.ts";

const escapeHtml = (s: string) =>
  s.replace(/[&<>"']/g, (c) => ({ "&": "&amp;", "<": "&lt;", ">": "&gt;", '"': "&quot;", "'": "&#39;" })[c]!);

export function invitationMail(p: { workshopName: string; inviterName: string; role: string; link: string }) {
  const role = roleLabels[p.role as RoleName] ?? p.role;
  const subject = `You are invited to ${p.workshopName} on Tinelog`;
  const text = [
    `${p.inviterName} invites you to join ${p.workshopName} on Tinelog as ${role}.`,
    "",
    "Tinelog keeps the workshop's measured record of every strike: pitch, overtones and decay of each unit.",
    "",
    `Accept the invitation: ${p.link}`,
    "",
    "The link is valid for 7 days. If you did not expect this message, you can ignore it.",
  ].join("\n");
  const html = `<p>${escapeHtml(p.inviterName)} invites you to join <strong>${escapeHtml(p.workshopName)}</strong> on Tinelog as ${escapeHtml(role)}.</p>
<p><a href="${escapeHtml(p.link)}">Accept the invitation</a></p>
<p style="color:#666">The link is valid for 7 days. If you did not expect this message, you can ignore it.</p>`;
  return { subject, text, html };
}

/** The link that confirms a new account's address (sent on sign-up and on a sign-in before confirming). */
export function verifyAddressMail(p: { name: string; link: string }) {
  const subject = "Confirm your e-mail address for Tinelog";
  const text = [
    `Hello ${p.name},`,
    "",
    "Confirm that this address is yours to finish creating your Tinelog account:",
    p.link,
    "",
    "The link is valid for 24 hours. If you did not create an account, ignore this message; nothing happens without the link.",
  ].join("\n");
  const html = `<p>Hello ${escapeHtml(p.name)},</p>
<p>Confirm that this address is yours to finish creating your Tinelog account:</p>
<p><a href="${escapeHtml(p.link)}">Confirm my address</a></p>
<p style="color:#666">The link is valid for 24 hours. If you did not create an account, ignore this message; nothing happens without the link.</p>`;
  return { subject, text, html };
}

/** Someone asked to create an account with an address that already has one. */
export function existingAccountMail(p: { name: string; signInLink: string; resetLink: string }) {
  const subject = "Someone tried to create a Tinelog account with your address";
  const text = [
    `Hello ${p.name},`,
    "",
    "A new Tinelog account was asked for with this e-mail address, which already has an account. Nothing was changed.",
    "",
    `If it was you, sign in instead: ${p.signInLink}`,
    `Forgot the password? Choose a new one: ${p.resetLink}`,
    "",
    "If it was not you, ignore this message.",
  ].join("\n");
  const html = `<p>Hello ${escapeHtml(p.name)},</p>
<p>A new Tinelog account was asked for with this e-mail address, which already has an account. Nothing was changed.</p>
<p>If it was you, <a href="${escapeHtml(p.signInLink)}">sign in</a> instead. Forgot the password? <a href="${escapeHtml(p.resetLink)}">Choose a new one</a>.</p>
<p style="color:#666">If it was not you, ignore this message.</p>`;
  return { subject, text, html };
}

/** The link to choose a new password. */
export function resetPasswordMail(p: { name: string; link: string }) {
  const subject = "Choose a new Tinelog password";
  const text = [
    `Hello ${p.name},`,
    "",
    "Someone (we hope you) asked to reset the password of your Tinelog account. Choose a new one here:",
    p.link,
    "",
    "The link works once and for one hour. Choosing a new password signs out every device where you were signed in.",
    "If you did not ask for this, ignore this message; your password stays as it is.",
  ].join("\n");
  const html = `<p>Hello ${escapeHtml(p.name)},</p>
<p>Someone (we hope you) asked to reset the password of your Tinelog account.</p>
<p><a href="${escapeHtml(p.link)}">Choose a new password</a></p>
<p style="color:#666">The link works once and for one hour. Choosing a new password signs out every device where you were signed in. If you did not ask for this, ignore this message; your password stays as it is.</p>`;
  return { subject, text, html };
}
