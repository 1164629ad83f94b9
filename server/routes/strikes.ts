/**
 * Strike upload and read-back. The upload is checked in this order, each with its own answer:
 * declared size (413 before the body is read), disk and quota (507/413), the multipart stream with
 * its byte limit (413 mid-stream), the RIFF/WAVE/fmt bytes (415), format bounds (422), fields (400),
 * duplicate (409). Only then is the file moved into the store and the strike queued (202).
 */
import { randomUUID } from "node:crypto";
import { open } from "node:fs/promises";
import type { NextFunction, Request, Response } from "express";
import { Router } from "express";
import multer from "multer";
import { dispositionInputSchema, updateUnitSchema } from "../../shared/schemas/batch.ts";
import { strikeUploadFieldsSchema } from "../../shared/schemas/strike.ts";
import { serialFromFileName } from "../../shared/serials.ts";
import { cleanStrings, stripControlCharacters } from "../../shared/text.ts";
import { AnalysisInputError } from "../analysis/errors.ts";
import { readWavHeader } from "../analysis/wav.ts";
import { and, asc, eq } from "drizzle-orm";
import { unit } from "../db/schema.ts";
import { badRequest, conflict, HttpError } from "../http-error.ts";
import { requirePermission, userOf, workshopOf } from "../middleware/guards.ts";
import { assertQueueRoom } from "../services/analysis-queue.ts";
import { audit } from "../services/audit.ts";
import { findBatch } from "../services/batches.ts";
import { assertNotDuplicate, findUnit, getStrike, getUnit, insertStrike, nextUnmeasured, recordDisposition, strikeFile } from "../services/strikes.ts";
import type { AppDeps } from "../app.ts";

const HEADER_BYTES = 1 << 20;
/** Upload policy on top of what the decoder accepts (readWavHeader already bounds channels and duration). */
const LIMITS = { minRate: 8000, maxRate: 384_000 };

export function strikeRoutes(deps: AppDeps) {
  const { db, sqlite, storage, queue, env } = deps;
  const r = Router();
  const limitBytes = env.UPLOAD_LIMIT_MB * 1024 * 1024;
  const queueLimits = { total: env.ANALYSIS_QUEUE, perWorkshop: env.ANALYSIS_QUEUE_PER_WORKSHOP };
  const tooLarge = () => new HttpError(413, "payload_too_large", `The recording is larger than the upload limit of ${env.UPLOAD_LIMIT_MB} MB. Trim it to the strike and its ring (a few seconds), then upload again.`);

  const receive = multer({
    storage: multer.diskStorage({ destination: storage.incoming, filename: (_req, _file, cb) => cb(null, `${randomUUID()}.part`) }),
    limits: { fileSize: limitBytes, files: 1, fields: 10, fieldSize: 1024, parts: 12 },
    // Browsers send the file name as UTF-8 bytes; read it so ("Stimmgabel-Ä.wav", "音叉.wav"), not as Latin-1.
    defParamCharset: "utf8",
  }).single("audio");

  /** Refuse before reading the body when it cannot fit. */
  const precheck = (req: Request, _res: Response, next: NextFunction) => {
    const declared = Number(req.get("content-length") ?? 0);
    if (declared > limitBytes + 64 * 1024) return next(tooLarge());
    if (!(req.get("content-type") ?? "").startsWith("multipart/form-data")) {
      return next(new HttpError(415, "unsupported_media_type", "Send the recording as multipart/form-data with the WAV file in the field \"audio\"."));
    }
    try {
      storage.checkRoom(db, workshopOf(req).id, declared);
      // Early, before the body is read; checked again exactly when the strike is inserted.
      assertQueueRoom(db, workshopOf(req).id, queueLimits);
      next();
    } catch (error) {
      next(error);
    }
  };

  const multipart = (req: Request, res: Response, next: NextFunction) => {
    receive(req, res, (error: unknown) => {
      if (!error) {
        // Text fields and the file name are stored: no control characters (shared/text.ts).
        req.body = cleanStrings(req.body ?? {});
        if (req.file) req.file.originalname = stripControlCharacters(req.file.originalname);
        return next();
      }
      if (error instanceof multer.MulterError) {
        if (error.code === "LIMIT_FILE_SIZE") return next(tooLarge());
        if (error.code === "LIMIT_UNEXPECTED_FILE") return next(badRequest(`Put the WAV file in the field "audio", one file per request.`, { audio: "Expected one file in the field audio" }));
        return next(badRequest(`The upload could not be read (${error.message}).`));
      }
      // The multipart parser's own errors (a bad part header, no end boundary, no boundary) carry no
      // system error code; a disk error (ENOSPC, EACCES) does and stays a server error.
      if (error instanceof Error && !(error as NodeJS.ErrnoException).code) {
        return next(badRequest(`The upload is not a well-formed multipart body (${error.message}). Send it again from Tinelog's upload screen, or as multipart/form-data with the WAV in the field "audio".`));
      }
      next(error);
    });
  };

  async function accept(req: Request, unitId: string) {
    const file = req.file;
    if (!file) throw badRequest('Attach a WAV recording in the field "audio".', { audio: "No file received" });
    let kept = false;
    try {
      const handle = await open(file.path, "r");
      const head = new Uint8Array(Math.min(HEADER_BYTES, file.size));
      await handle.read(head, 0, head.length, 0);
      await handle.close();
      let header;
      try {
        header = readWavHeader(head, { fileSize: file.size });
      } catch (error) {
        if (error instanceof AnalysisInputError) {
          const status = error.code === "not_wav" ? 415 : 422;
          throw new HttpError(status, status === 415 ? "unsupported_media_type" : "unprocessable", error.message, { audio: error.message });
        }
        throw error;
      }
      if (header.sampleRate < LIMITS.minRate || header.sampleRate > LIMITS.maxRate) {
        throw new HttpError(422, "unprocessable", `The sample rate is ${header.sampleRate} Hz; Tinelog accepts ${LIMITS.minRate}–${LIMITS.maxRate} Hz. Record at 44.1 or 48 kHz.`, { audio: "Sample rate out of range" });
      }
      const fields = strikeUploadFieldsSchema.parse(req.body ?? {});
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
        });
        queue.notify();
        return row;
      } catch (error) {
        // The row did not land: the file must not stay behind without it.
        storage.discard(storage.pathOf(fileKey));
        throw error;
      }
    } finally {
      if (!kept) storage.discard(file.path);
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

  return r;
}
