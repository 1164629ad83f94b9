/** The outbox: what this workshop sent, with the captured message when the capture server got it. */
import { Router } from "express";
import { notFound } from "../http-error.ts";
import { requirePermission, workshopOf } from "../middleware/guards.ts";
import { getOutboxMessage, listOutbox } from "../services/outbox.ts";
import type { AppDeps } from "../app.ts";

export function mailRoutes({ db }: AppDeps) {
  const r = Router();
  const guard = requirePermission("mail", "read");

  r.get("/mail", guard, async (req, res) => {
    res.json({ messages: await listOutbox(db, workshopOf(req).id) });
  });

  r.get("/mail/:id/html", guard, async (req, res) => {
    const m = await getOutboxMessage(db, workshopOf(req).id, String(req.params.id));
    if (!m?.html) throw notFound("That message's HTML part");
    res.type("html").set("Content-Security-Policy", "default-src 'none'; style-src 'unsafe-inline'; img-src data:").send(m.html);
  });

  r.get("/mail/:id/attachments/:index", guard, async (req, res) => {
    const m = await getOutboxMessage(db, workshopOf(req).id, String(req.params.id));
    const a = m?.attachmentData[Number(req.params.index)];
    if (!a) throw notFound("That attachment");
    res.type(a.contentType).attachment(a.filename).send(a.content);
  });

  return r;
}
