/**
 * The outbox: what this workshop sent, with the captured message when the capture server got it.
 * The owner reads every mail; quality reads the certificate mails it sent (not invitations).
 */
import type { Request } from "express";
import { Router } from "express";
import { can } from "../../shared/permissions.ts";
import { notFound } from "../http-error.ts";
import { requirePermission, workshopOf } from "../middleware/guards.ts";
import { CERTIFICATE_MAIL_KINDS, getOutboxMessage, listOutbox } from "../services/outbox.ts";
import type { AppDeps } from "../app.ts";

/** The kinds of mail the caller may read: all for the owner, certificate mail for quality. */
const kindsFor = (req: Request) => (can(workshopOf(req).role, "mail", "read") ? null : CERTIFICATE_MAIL_KINDS);

export function mailRoutes({ db }: AppDeps) {
  const r = Router();
  const guard = requirePermission("mail", "read-certificates");

  r.get("/mail", guard, async (req, res) => {
    res.json({ messages: await listOutbox(db, workshopOf(req).id, kindsFor(req)) });
  });

  r.get("/mail/:id/html", guard, async (req, res) => {
    const m = await getOutboxMessage(db, workshopOf(req).id, String(req.params.id), kindsFor(req));
    if (!m?.html) throw notFound("That message's HTML part");
    res.type("html").set("Content-Security-Policy", "default-src 'none'; style-src 'unsafe-inline'; img-src data:").send(m.html);
  });

  r.get("/mail/:id/attachments/:index", guard, async (req, res) => {
    const m = await getOutboxMessage(db, workshopOf(req).id, String(req.params.id), kindsFor(req));
    const a = m?.attachmentData[Number(req.params.index)];
    if (!a) throw notFound("That attachment");
    res.type(a.contentType).attachment(a.filename).send(a.content);
  });

  return r;
}
