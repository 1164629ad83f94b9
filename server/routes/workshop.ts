/** The active workshop: its profile (used on certificates and mail), dashboard and audit trail. */
import { and, desc, eq, inArray, lt } from "drizzle-orm";
import { Router } from "express";
import { SAMPLE_CLOCK_HALF_WIDTH_PPM, TEMPERATURE_COEFFICIENT_RELATIVE_HALF_WIDTH, THERMOMETER_HALF_WIDTH_C } from "../../shared/evaluation.ts";
import { auditQuerySchema, type AuditPage } from "../../shared/schemas/audit.ts";
import { workshopProfileSchema } from "../../shared/schemas/workshop.ts";
import { auditEvent, certificate, strike, user, workshopProfile } from "../db/schema.ts";
import { requirePermission, userOf, workshopOf } from "../middleware/guards.ts";
import { audit } from "../services/audit.ts";
import { getBatch, listBatches } from "../services/batches.ts";
import { instrumentsDue } from "../services/instruments.ts";
import type { AppDeps } from "../app.ts";



export function workshopRoutes({ db, readCache }: AppDeps) {
  const r = Router();

  r.get("/workshop", requirePermission("workshop", "read"), (req, res) => {
    const w = workshopOf(req);
    const p = db.select().from(workshopProfile).where(eq(workshopProfile.workshopId, w.id)).get();
    res.json({
      ...w,
      profile: {
        address: p?.address ?? "",
        sendingEmail: p?.sendingEmail ?? "",
        qualityEmail: p?.qualityEmail ?? "",
        certificatePrefix: p?.certificatePrefix ?? "TL",
        clockTolerancePpm: p?.clockTolerancePpm ?? SAMPLE_CLOCK_HALF_WIDTH_PPM,
        thermometerToleranceC: p?.thermometerToleranceC ?? THERMOMETER_HALF_WIDTH_C,
        tempCoefficientTolerancePercent: p?.tempCoefficientTolerancePercent ?? TEMPERATURE_COEFFICIENT_RELATIVE_HALF_WIDTH * 100,
      },
    });
  });

  r.put("/workshop/profile", requirePermission("workshop", "update"), (req, res) => {
    const w = workshopOf(req);
    const input = workshopProfileSchema.parse(req.body);
    db.transaction((tx) => {
      const before = tx.select().from(workshopProfile).where(eq(workshopProfile.workshopId, w.id)).get() ?? null;
      tx.insert(workshopProfile).values({ workshopId: w.id, ...input }).onConflictDoUpdate({ target: workshopProfile.workshopId, set: { ...input, updatedAt: new Date() } }).run();
      audit(tx, { workshopId: w.id, userId: userOf(req).id }, "workshop.profile", "workshop", w.id, { before, after: input });
    });
    res.json({ ok: true });
  });

  r.get("/dashboard", requirePermission("batch", "read"), (req, res) => {
    const w = workshopOf(req).id;
    const batches = readCache.get(`batches:${w}`, () => listBatches(db, w));
    const openBatches = batches.filter((b) => b.state !== "released");
    // Units QA still has to decide on: a verdict other than within tolerance and no disposition that closes them.
    const awaitingReview = openBatches.reduce((n, b) => {
      const detail = readCache.get(`batch:${w}:${b.id}`, () => getBatch(db, w, b.id));
      return n + detail.rows.filter((r) => r.open && r.verdict !== null && r.verdict !== "within_tolerance" && r.pendingStrikes === 0).length;
    }, 0);
    res.json({ openBatches, awaitingReview, released: batches.length - openBatches.length, instrumentsDue: instrumentsDue(db, w) });
  });

  /**
   * The trail, newest first, a page of at most 100 events at a time (`cursor` = the previous page's
   * `nextCursor`). Each row holds the actor's id; the name is joined here, so a long name is stored once.
   */
  r.get("/audit", requirePermission("audit", "read"), (req, res) => {
    const w = workshopOf(req);
    const q = auditQuerySchema.parse(req.query);
    // A unit's history: the unit's own events and those of its strikes and certificates.
    const ids = q.unitId
      ? [
          q.unitId,
          ...db.select({ id: strike.id }).from(strike).where(and(eq(strike.unitId, q.unitId), eq(strike.workshopId, w.id))).all().map((r) => r.id),
          ...db.select({ id: certificate.id }).from(certificate).where(and(eq(certificate.unitId, q.unitId), eq(certificate.workshopId, w.id))).all().map((r) => r.id),
        ]
      : q.entityId
        ? [q.entityId]
        : null;
    const rows = db
      .select({ e: auditEvent, actor: user.name })
      .from(auditEvent)
      .leftJoin(user, eq(user.id, auditEvent.actorId))
      .where(and(eq(auditEvent.workshopId, w.id), ids ? inArray(auditEvent.entityId, ids) : undefined, q.cursor ? lt(auditEvent.id, Number(q.cursor)) : undefined))
      .orderBy(desc(auditEvent.id))
      .limit(q.limit + 1)
      .all();
    const page = rows.slice(0, q.limit);
    const body: AuditPage = {
      events: page.map(({ e, actor }) => ({ id: e.id, action: e.action, entity: e.entity, entityId: e.entityId, before: e.before, after: e.after, at: e.at.toISOString(), actor: actor ?? "Tinelog" })),
      nextCursor: rows.length > q.limit ? String(page.at(-1)!.e.id) : null,
    };
    res.json(body);
  });

  return r;
}
