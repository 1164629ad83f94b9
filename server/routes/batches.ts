import { Router } from "express";
import { addUnitsSchema, createBatchSchema } from "../../shared/schemas/batch.ts";
import { issueBatchCertificateSchema } from "../../shared/schemas/batch-certificate.ts";
import { bulkDispositionSchema } from "../../shared/schemas/corrections.ts";
import { requirePermission, userOf, workshopOf } from "../middleware/guards.ts";
import { issueBatchCertificate, issueUnitCertificates, listBatchCertificates, unitCertificatePlan } from "../services/batch-certificates.ts";
import { addUnits, createBatch, findBatch, getBatch, listBatches, markInReview, releaseBatch } from "../services/batches.ts";
import { recordBulkDisposition } from "../services/dispositions.ts";
import { ledgerCsv } from "../services/ledger-csv.ts";
import { nextUnmeasured } from "../services/strikes.ts";
import { issuerOf } from "./certificates.ts";
import type { AppDeps } from "../app.ts";

export function batchRoutes({ db, sqlite, readCache, certificates, env }: AppDeps) {
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

  /** One disposition for the selected units, all or nothing. */
  r.post("/batches/:id/dispositions", requirePermission("disposition", "create"), (req, res) => {
    findBatch(db, workshopOf(req).id, String(req.params.id));
    res.status(201).json(recordBulkDisposition(db, sqlite, actor(req), String(req.params.id), bulkDispositionSchema.parse(req.body)));
  });

  /** What issuing every unit's certificate would do (issue or skip, and why), before it is done. */
  r.get("/batches/:id/unit-certificates", requirePermission("certificate", "read"), (req, res) => {
    res.json({ plan: unitCertificatePlan(db, workshopOf(req).id, String(req.params.id)) });
  });

  /**
   * Issues every unit's certificate, streaming one JSON line per unit as it is done (NDJSON), then a
   * summary line. Refusals of the whole run (not released, no profile) answer before streaming.
   */
  r.post("/batches/:id/unit-certificates", requirePermission("certificate", "issue"), async (req, res) => {
    const w = workshopOf(req).id;
    const id = String(req.params.id);
    unitCertificatePlan(db, w, id);
    res.status(200).type("application/x-ndjson").set("Cache-Control", "no-store");
    res.flushHeaders();
    const line = (value: unknown) => res.write(`${JSON.stringify(value)}\n`);
    try {
      const outcomes = await issueUnitCertificates(certificates, issuerOf(req), id, (outcome, done, total) => line({ type: "progress", done, total, ...outcome }));
      const count = (o: string) => outcomes.filter((x) => x.outcome === o).length;
      line({ type: "summary", issued: count("issued"), skipped: count("skipped"), failed: count("failed"), outcomes });
    } catch (error) {
      req.log?.error({ err: error }, "bulk certificate issue stopped");
      line({ type: "error", message: error instanceof Error && "status" in error ? error.message : "The run stopped on a server error; the certificates listed above were issued. Run it again for the rest." });
    }
    res.end();
  });

  r.get("/batches/:id/certificates", requirePermission("certificate", "read"), (req, res) => {
    res.json({ certificates: listBatchCertificates(db, workshopOf(req).id, String(req.params.id), env.baseUrl) });
  });
  r.post("/batches/:id/certificates", requirePermission("certificate", "issue"), async (req, res) => {
    findBatch(db, workshopOf(req).id, String(req.params.id));
    const input = issueBatchCertificateSchema.parse(req.body);
    const c = await issueBatchCertificate(certificates, issuerOf(req), String(req.params.id), input);
    res.status(201).json({ number: c.number, verifyUrl: c.verifyUrl, certificate: c });
  });
  return r;
}
