/** An explicit re-evaluation of a unit: appends a new evaluation with the calibrations as they stand now. */
import { Router } from "express";
import { requirePermission, userOf, workshopOf } from "../middleware/guards.ts";
import { findUnit, reevaluateUnit } from "../services/strikes.ts";
import type { AppDeps } from "../app.ts";

export function evaluationRoutes({ db, sqlite }: AppDeps) {
  const r = Router();
  r.post("/units/:id/evaluations", requirePermission("evaluation", "create"), (req, res) => {
    const workshopId = workshopOf(req).id;
    findUnit(db, workshopId, String(req.params.id));
    res.status(201).json(reevaluateUnit(db, sqlite, { workshopId, userId: userOf(req).id }, String(req.params.id)));
  });
  return r;
}
