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
