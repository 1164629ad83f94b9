/** Who is signed in, their workshops, and the public invitation look-up for the sign-up page. */
import { eq } from "drizzle-orm";
import { Router } from "express";
import { invitation, organization, user } from "../db/schema.ts";
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

  r.get("/invitations/:id", publicRoute, (req, res) => {
    const row = db
      .select({
        id: invitation.id,
        email: invitation.email,
        role: invitation.role,
        status: invitation.status,
        expiresAt: invitation.expiresAt,
        workshopName: organization.name,
        inviterName: user.name,
      })
      .from(invitation)
      .innerJoin(organization, eq(organization.id, invitation.organizationId))
      .innerJoin(user, eq(user.id, invitation.inviterId))
      .where(eq(invitation.id, String(req.params.id)))
      .get();
    if (row) return res.json(row);
    // The invitation page asks with ?notFound=ok: an old or mistyped link is an expected visitor, not an error.
    if (req.query.notFound === "ok") return res.json({ found: false });
    throw notFound("That invitation");
  });

  return r;
}
