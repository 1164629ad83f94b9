import { Router } from "express";
import { specInputSchema } from "../../shared/schemas/spec.ts";
import { requirePermission, userOf, workshopOf } from "../middleware/guards.ts";
import { addSpecVersion, createSpec, getSpec, listSpecs } from "../services/specs.ts";
import type { AppDeps } from "../app.ts";

export function specRoutes({ db }: AppDeps) {
  const r = Router();
  const read = requirePermission("spec", "read");
  const write = requirePermission("spec", "write");
  const actor = (req: Parameters<typeof workshopOf>[0]) => ({ workshopId: workshopOf(req).id, userId: userOf(req).id });

  r.get("/specs", read, (req, res) => {
    res.json({ specs: listSpecs(db, workshopOf(req).id) });
  });
  r.post("/specs", write, (req, res) => {
    res.status(201).json(createSpec(db, actor(req), specInputSchema.parse(req.body)));
  });
  r.get("/specs/:id", read, (req, res) => {
    res.json(getSpec(db, workshopOf(req).id, String(req.params.id)));
  });
  r.post("/specs/:id/versions", write, (req, res) => {
    getSpec(db, workshopOf(req).id, String(req.params.id)); // 404 before validation: never hint at another workshop's ids
    res.status(201).json(addSpecVersion(db, actor(req), String(req.params.id), specInputSchema.parse(req.body)));
  });
  return r;
}
