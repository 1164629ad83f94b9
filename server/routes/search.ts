/** Search across the active workshop (serials, batch codes, certificate numbers, customers). */
import { Router } from "express";
import { searchQuerySchema } from "../../shared/schemas/corrections.ts";
import { requirePermission, workshopOf } from "../middleware/guards.ts";
import { search } from "../services/search.ts";
import type { AppDeps } from "../app.ts";

export function searchRoutes({ db }: AppDeps) {
  const r = Router();
  r.get("/search", requirePermission("batch", "read"), (req, res) => {
    const { q } = searchQuerySchema.parse({ q: typeof req.query.q === "string" ? req.query.q : undefined });
    res.set("Cache-Control", "no-store").json(search(db, workshopOf(req).id, q));
  });
  return r;
}
