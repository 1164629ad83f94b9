/** Who is signed in, their workshops, and the public invitation look-up for the sign-up page. */
import { and, eq, gt } from "drizzle-orm";
import { Router } from "express";
import { invitation, organization } from "../db/schema.ts";
import { notFound } from "../http-error.ts";
import { listWorkshops } from "../middleware/context.ts";
import { publicRoute } from "../middleware/guards.ts";
import type { AppDeps } from "../app.ts";

export function sessionRoutes({ db }: AppDeps) {
  const r = Router();

  r.get("/health", publicRoute, (_req, res) => {
    res.json({ ok: true });
  });

  // Open to anyone: a signed-out browser asks on every page, and "nobody is signed in" is an
  // answer, not an error (a 401 here would log an error in the console of every public page).
  r.get("/me", publicRoute, (req, res) => {
    const u = req.ctx.user;
    if (!u) return res.json({ user: null, workshops: [], activeWorkshop: null });
    res.json({ user: u, workshops: listWorkshops(db, u.id), activeWorkshop: req.ctx.workshop });
  });

  /**
   * Anyone holding the link sees what they need to decide, and no more: the workshop's name and the
   * role. The address it was sent to and who sent it stay private (the link may be forwarded or
   * leaked), and an invitation that is no longer open (accepted, cancelled, expired) is not found.
   */
  r.get("/invitations/:id", publicRoute, (req, res) => {
    const row = db
      .select({ id: invitation.id, workshopName: organization.name, role: invitation.role })
      .from(invitation)
      .innerJoin(organization, eq(organization.id, invitation.organizationId))
      .where(and(eq(invitation.id, String(req.params.id)), eq(invitation.status, "pending"), gt(invitation.expiresAt, new Date())))
      .get();
    if (row) return res.json(row);
    // The invitation page asks with ?notFound=ok: an old or mistyped link is an expected visitor, not an error.
    if (req.query.notFound === "ok") return res.json({ found: false });
    throw notFound("That invitation");
  });

  return r;
}
