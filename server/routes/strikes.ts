/**
 * Strike upload and read-back. The upload is checked in this order, each with its own answer:
 * declared size (413 before the body is read), disk and quota (507/413), a full analysis queue
 * (503), the multipart stream with its byte limit (413 mid-stream), the RIFF/WAVE/fmt bytes (415),
 * format bounds (422) — those in ./wav-upload.ts — then fields (400) and duplicate (409). Only then
 * is the file moved into the store and the strike queued (202).
 */
import type { NextFunction, Request, Response } from "express";
import { Router } from "express";
import { dispositionInputSchema, updateUnitSchema } from "../../shared/schemas/batch.ts";
import { strikeUploadFieldsSchema } from "../../shared/schemas/strike.ts";
import { supersedeDispositionSchema, voidStrikeSchema } from "../../shared/schemas/corrections.ts";
import { serialFromFileName } from "../../shared/serials.ts";
import { and, asc, eq } from "drizzle-orm";
import { disposition, unit } from "../db/schema.ts";
import { badRequest, conflict, HttpError, notFound } from "../http-error.ts";
import { requirePermission, userOf, workshopOf } from "../middleware/guards.ts";
import { assertQueueRoom } from "../services/analysis-queue.ts";
import { audit } from "../services/audit.ts";
import { findBatch } from "../services/batches.ts";
import { recordDisposition, supersedeDisposition } from "../services/dispositions.ts";
import { assertNotDuplicate, findUnit, getStrike, getUnit, insertStrike, nextUnmeasured, strikeFile, voidStrike } from "../services/strikes.ts";
import { checkStrikeInstruments } from "../services/instruments.ts";
import type { AppDeps } from "../app.ts";
import { wavUpload } from "./wav-upload.ts";

export function strikeRoutes(deps: AppDeps) {
  const { db, sqlite, storage, queue, env } = deps;
  const r = Router();
  const queueLimits = { total: env.ANALYSIS_QUEUE, perWorkshop: env.ANALYSIS_QUEUE_PER_WORKSHOP };
  const upload = wavUpload(deps);
  const multipart = upload.multipart;
  // Beyond the upload's own checks: no new strike while the workshop's share of the analysis queue is
  // full (early, before the body is read; checked again exactly when the strike is inserted).
  const precheck = upload.precheck((req) => assertQueueRoom(db, workshopOf(req).id, queueLimits));

  async function accept(req: Request, unitId: string) {
    let kept = false;
    try {
      const { file, header } = await upload.checkedFile(req);
      const fields = strikeUploadFieldsSchema.parse(req.body ?? {});
      checkStrikeInstruments(db, workshopOf(req).id, fields, fields.temperatureC);
      // Again with the real size: a chunked upload declares none before it is read.
      storage.checkRoom(db, workshopOf(req).id, file.size);
      const sha256 = await storage.sha256Of(file.path);
      assertNotDuplicate(db, unitId, sha256);
      const actor = { workshopId: workshopOf(req).id, userId: userOf(req).id };
      const fileKey = storage.keep(file.path, actor.workshopId);
      kept = true;
      try {
        // Queue room and insert in one synchronous step: concurrent uploads cannot pass the limit together.
        assertQueueRoom(db, actor.workshopId, queueLimits);
        const row = insertStrike(db, actor, {
          unitId,
          originalName: file.originalname.slice(0, 255),
          sha256,
          fileKey,
          sizeBytes: file.size,
          format: { sampleRate: header.sampleRate, channels: header.channels, bitsPerSample: header.bitsPerSample, encoding: header.encoding, durationS: header.durationS },
          temperatureC: fields.temperatureC,
          support: fields.support,
          recorderId: fields.recorderId,
          thermometerId: fields.thermometerId,
        });
        queue.notify();
        return row;
      } catch (error) {
        // The row did not land: the file must not stay behind without it.
        storage.discard(storage.pathOf(fileKey));
        throw error;
      }
    } finally {
      if (!kept && req.file) storage.discard(req.file.path);
    }
  }

  const create = requirePermission("strike", "create");
  const read = requirePermission("strike", "read");

  const unitInWorkshop = (req: Request, _res: Response, next: NextFunction) => {
    try {
      const u = findUnit(db, workshopOf(req).id, String(req.params.id));
      const b = findBatch(db, u.workshopId, u.batchId);
      if (b.state === "released") throw conflict(`Batch ${b.code} is released; no more strikes can be added to it.`);
      next();
    } catch (error) {
      next(error);
    }
  };

  r.post("/units/:id/strikes", create, unitInWorkshop, precheck, multipart, async (req, res) => {
    const row = await accept(req, String(req.params.id));
    const u = findUnit(db, workshopOf(req).id, row.unitId);
    res.status(202).json({ id: row.id, state: row.state, unitId: u.id, serial: u.serial });
  });

  /** Quick path for a whole batch: the unit is matched by serial in the file name, or the next unmeasured one. */
  const batchOpen = (req: Request, _res: Response, next: NextFunction) => {
    try {
      const b = findBatch(db, workshopOf(req).id, String(req.params.id));
      if (b.state === "released") throw conflict(`Batch ${b.code} is released; no more strikes can be added to it.`);
      next();
    } catch (error) {
      next(error);
    }
  };
  r.post("/batches/:id/strikes", create, batchOpen, precheck, multipart, async (req, res) => {
    const batchId = String(req.params.id);
    const units = db.select({ id: unit.id, serial: unit.serial }).from(unit).where(and(eq(unit.batchId, batchId), eq(unit.workshopId, workshopOf(req).id))).orderBy(asc(unit.position)).all();
    const bySerial = req.file ? serialFromFileName(req.file.originalname, units.map((u) => u.serial)) : null;
    const target = bySerial ? units.find((u) => u.serial === bySerial)! : nextUnmeasured(db, batchId);
    if (!target) {
      if (req.file) storage.discard(req.file.path);
      throw conflict("No unit matches the file name and every unit of the batch has a strike already. Name the file after the unit's serial, or upload on the unit's page.", { audio: "No unit to match" });
    }
    const row = await accept(req, target.id);
    res.status(202).json({ id: row.id, state: row.state, unitId: target.id, serial: target.serial, matchedBy: bySerial ? "file name" : "next unmeasured unit" });
  });

  r.get("/strikes/:id", read, (req, res) => {
    res.json(getStrike(db, workshopOf(req).id, String(req.params.id)));
  });

  r.get("/strikes/:id/audio", read, (req, res, next) => {
    const f = strikeFile(db, workshopOf(req).id, String(req.params.id));
    // sendFile handles Range requests, so the waveform player can seek.
    res.type("audio/wav").sendFile(storage.pathOf(f.fileKey), { headers: { "Cache-Control": "private, max-age=3600" } }, (error) => error && next(error));
  });

  r.get("/units/:id", requirePermission("unit", "read"), (req, res) => {
    res.json(getUnit(db, workshopOf(req).id, String(req.params.id)));
  });

  r.patch("/units/:id", requirePermission("unit", "create"), (req, res) => {
    const u = findUnit(db, workshopOf(req).id, String(req.params.id));
    const input = updateUnitSchema.parse(req.body);
    const actor = { workshopId: u.workshopId, userId: userOf(req).id };
    db.transaction((tx) => {
      tx.update(unit).set(input).where(eq(unit.id, u.id)).run();
      audit(tx, actor, "unit.update", "unit", u.id, { before: { customerName: u.customerName, customerEmail: u.customerEmail }, after: input });
    });
    res.json(getUnit(db, u.workshopId, u.id));
  });

  r.post("/units/:id/dispositions", requirePermission("disposition", "create"), (req, res) => {
    findUnit(db, workshopOf(req).id, String(req.params.id));
    const input = dispositionInputSchema.parse(req.body);
    const actor = { workshopId: workshopOf(req).id, userId: userOf(req).id };
    res.status(201).json(recordDisposition(db, sqlite, actor, String(req.params.id), input));
  });

  /** Replaces the unit's standing disposition with a new decision and its reason (until release). */
  r.post("/dispositions/:id/supersede", requirePermission("disposition", "supersede"), (req, res) => {
    const d = db.select({ id: disposition.id }).from(disposition).where(and(eq(disposition.id, String(req.params.id)), eq(disposition.workshopId, workshopOf(req).id))).get();
    if (!d) throw notFound("That disposition");
    const input = supersedeDispositionSchema.parse(req.body);
    res.status(201).json(supersedeDisposition(db, sqlite, { workshopId: workshopOf(req).id, userId: userOf(req).id }, d.id, input));
  });

  /** Takes a strike out of the record with a reason; the unit is evaluated again without it. */
  r.post("/strikes/:id/void", requirePermission("strike", "void"), (req, res) => {
    strikeFile(db, workshopOf(req).id, String(req.params.id)); // 404 before validation
    const { reason } = voidStrikeSchema.parse(req.body);
    const w = workshopOf(req);
    res.json(voidStrike(db, sqlite, { workshopId: w.id, userId: userOf(req).id, role: w.role }, String(req.params.id), reason));
  });

  return r;
}
