import { Router } from "express";
import { addUnitsSchema, createBatchSchema } from "../../shared/schemas/batch.ts";
import { requirePermission, userOf, workshopOf } from "../middleware/guards.ts";
import { addUnits, createBatch, findBatch, getBatch, ledgerCsv, listBatches, markInReview, releaseBatch } from "../services/batches.ts";
import { nextUnmeasured } from "../services/strikes.ts";
import type { AppDeps } from "../app.ts";

export function batchRoutes({ db, sqlite, readCache }: AppDeps) {
  const r = Router();
  const read = requirePermission("batch", "read");
  const actor = (req: Parameters<typeof workshopOf>[0]) => ({ workshopId: workshopOf(req).id, userId: userOf(req).id });

  r.get("/batches", read, (req, res) => {
    const w = workshopOf(req).id;
    res.json({ batches: readCache.get(`batches:${w}`, () => listBatches(db, w)) });
  });
  r.post("/batches", requirePermission("batch", "create"), (req, res) => {
    res.status(201).json(createBatch(db, actor(req), createBatchSchema.parse(req.body)));
  });
  r.get("/batches/:id", read, (req, res) => {
    const w = workshopOf(req).id;
    const id = String(req.params.id);
    res.json(readCache.get(`batch:${w}:${id}`, () => getBatch(db, w, id)));
  });
  r.get("/batches/:id/next-unit", read, (req, res) => {
    const b = findBatch(db, workshopOf(req).id, String(req.params.id));
    res.json({ unit: nextUnmeasured(db, b.id) });
  });
  r.post("/batches/:id/units", requirePermission("unit", "create"), (req, res) => {
    findBatch(db, workshopOf(req).id, String(req.params.id));
    res.status(201).json(addUnits(db, actor(req), String(req.params.id), addUnitsSchema.parse(req.body)));
  });
  r.get("/batches/:id/ledger.csv", read, (req, res) => {
    const { filename, csv } = ledgerCsv(db, workshopOf(req).id, String(req.params.id));
    res.type("text/csv; charset=utf-8").attachment(filename).send(csv);
  });
  r.post("/batches/:id/review", requirePermission("batch", "create"), (req, res) => {
    res.json(markInReview(db, actor(req), String(req.params.id)));
  });
  r.post("/batches/:id/release", requirePermission("batch", "release"), (req, res) => {
    res.json(releaseBatch(db, sqlite, actor(req), String(req.params.id)));
  });
  return r;
}
