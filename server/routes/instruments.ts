/**
 * Instruments and their calibrations. A recorder is calibrated with recordings of reference tones
 * (multipart: one or more files in `audio`, each with its `referenceHz`), measured in the analysis
 * workers while the request waits; a thermometer with the points of its certificate (JSON).
 * Owner and QA write, everyone in the workshop reads; another workshop's ids are 404.
 */
import { randomUUID } from "node:crypto";
import { open } from "node:fs/promises";
import type { NextFunction, Request, Response } from "express";
import { Router } from "express";
import multer from "multer";
import { createInstrumentSchema, recorderCalibrationFieldsSchema } from "../../shared/schemas/instrument.ts";
import { AnalysisInputError } from "../analysis/errors.ts";
import { ReferenceToneRefused } from "../analysis/reference-tone.ts";
import { readWavHeader } from "../analysis/wav.ts";
import { badRequest, HttpError } from "../http-error.ts";
import { requirePermission, userOf, workshopOf } from "../middleware/guards.ts";
import { createInstrument, findInstrument, getInstrument, listInstruments, measuredTone, recordRecorderCalibration, recordThermometerCalibration, type MeasuredTone } from "../services/instruments.ts";
import { PoolBusyError } from "../workers/analysis-pool.ts";
import type { AppDeps } from "../app.ts";

/** At most this many reference recordings in one calibration. */
const MAX_TONES = 8;
/** A reference recording longer than this is refused before analysis (the analysis uses the first ~40 s anyway). */
const MAX_REFERENCE_S = 120;

export function instrumentRoutes(deps: AppDeps) {
  const { db, sqlite, storage, pool, env } = deps;
  const r = Router();
  const read = requirePermission("instrument", "read");
  const write = requirePermission("instrument", "write");
  const actor = (req: Request) => ({ workshopId: workshopOf(req).id, userId: userOf(req).id });
  const limitBytes = env.UPLOAD_LIMIT_MB * 1024 * 1024;

  r.get("/instruments", read, (req, res) => {
    res.json({ instruments: listInstruments(db, workshopOf(req).id) });
  });

  r.post("/instruments", write, (req, res) => {
    const { id } = createInstrument(db, actor(req), createInstrumentSchema.parse(req.body));
    res.status(201).json({ id, instrument: getInstrument(db, workshopOf(req).id, id) });
  });

  r.get("/instruments/:id", read, (req, res) => {
    res.json(getInstrument(db, workshopOf(req).id, String(req.params.id)));
  });

  const receive = multer({
    storage: multer.diskStorage({ destination: storage.incoming, filename: (_req, _file, cb) => cb(null, `${randomUUID()}.part`) }),
    limits: { fileSize: limitBytes, files: MAX_TONES, fields: 40, fieldSize: 1024, parts: MAX_TONES + 40 },
  }).array("audio", MAX_TONES);

  /** The instrument must be this workshop's before anything of the body is read. */
  const instrumentInWorkshop = (req: Request, _res: Response, next: NextFunction) => {
    try {
      findInstrument(db, workshopOf(req).id, String(req.params.id));
      next();
    } catch (error) {
      next(error);
    }
  };

  /** A recorder's calibration comes as multipart; a thermometer's as JSON (already parsed). */
  const multipartWhenSent = (req: Request, res: Response, next: NextFunction) => {
    if (!(req.get("content-type") ?? "").startsWith("multipart/form-data")) return next();
    const declared = Number(req.get("content-length") ?? 0);
    if (declared > limitBytes + 64 * 1024) {
      return next(new HttpError(413, "payload_too_large", `The reference recordings together are larger than the upload limit of ${env.UPLOAD_LIMIT_MB} MB. Trim each to 5–30 s of the tone.`));
    }
    receive(req, res, (error: unknown) => {
      if (!error) return next();
      if (error instanceof multer.MulterError) {
        if (error.code === "LIMIT_FILE_SIZE") return next(new HttpError(413, "payload_too_large", `A reference recording is larger than the upload limit of ${env.UPLOAD_LIMIT_MB} MB. Trim it to 5–30 s of the tone.`));
        if (error.code === "LIMIT_FILE_COUNT" || error.code === "LIMIT_UNEXPECTED_FILE") {
          return next(badRequest(`Put the reference recordings in the field "audio", at most ${MAX_TONES} in one calibration.`, { audio: `At most ${MAX_TONES} files in the field audio` }));
        }
        return next(badRequest(`The upload could not be read (${error.message}).`));
      }
      next(error);
    });
  };

  r.post("/instruments/:id/calibrations", write, instrumentInWorkshop, multipartWhenSent, async (req, res) => {
    const files = (req.files as Express.Multer.File[] | undefined) ?? [];
    try {
      const inst = findInstrument(db, workshopOf(req).id, String(req.params.id));
      const multipart = (req.get("content-type") ?? "").startsWith("multipart/form-data");
      if (inst.kind === "thermometer") {
        if (multipart) throw badRequest(`“${inst.name}” is a thermometer: send the points of its calibration certificate as JSON, not a recording.`);
        const calibration = recordThermometerCalibration({ db, sqlite }, actor(req), inst, req.body);
        return res.status(201).json({ id: calibration.id, offsetPpm: null, offsetUncertaintyPpm: null, validUntil: calibration.validUntil, calibration });
      }
      if (!multipart) {
        throw new HttpError(415, "unsupported_media_type", `“${inst.name}” is a recorder: send its reference recordings as multipart/form-data, the WAV files in the field "audio" with their "referenceHz".`);
      }
      if (files.length === 0) throw badRequest('Attach the recording of the reference tone in the field "audio".', { audio: "No file received" });
      const fields = recorderCalibrationFieldsSchema.parse(req.body ?? {});
      const perFile = <T,>(list: T[], field: string): T[] => {
        if (list.length === files.length) return list;
        if (list.length === 1) return files.map(() => list[0]);
        throw badRequest(`Give "${field}" once for all ${files.length} recordings or once for each, in the order of the files (got ${list.length}).`, { [field]: `${list.length} values for ${files.length} files` });
      };
      if (fields.referenceHz.length !== files.length) {
        throw badRequest(`Give one "referenceHz" for each recording, in the order of the files: ${files.length} file${files.length === 1 ? "" : "s"}, ${fields.referenceHz.length} frequenc${fields.referenceHz.length === 1 ? "y" : "ies"}.`, {
          referenceHz: `${fields.referenceHz.length} values for ${files.length} files`,
        });
      }
      const uncertainties = perFile(fields.referenceUncertaintyHz, "referenceUncertaintyHz");
      const certificates = perFile(fields.referenceCertificate, "referenceCertificate");
      const tones: MeasuredTone[] = [];
      for (const [i, file] of files.entries()) {
        const name = file.originalname.slice(0, 255);
        await checkReferenceHeader(file.path, file.size, name);
        let m;
        try {
          m = await pool.measureReferenceFile(file.path, fields.referenceHz[i]);
        } catch (error) {
          if (error instanceof ReferenceToneRefused || error instanceof AnalysisInputError) {
            throw new HttpError(422, "unprocessable", `“${name}” cannot calibrate the recorder: ${error.message}`, { audio: error.message });
          }
          if (error instanceof PoolBusyError) throw new HttpError(503, "busy", "The analysis is busy with uploads; nothing was stored. Send the calibration again in a minute.");
          throw error;
        }
        tones.push(
          measuredTone(
            m,
            { referenceHz: fields.referenceHz[i], expandedUncertaintyHz: uncertainties[i], coverageFactor: fields.referenceCoverageFactor, certificate: certificates[i] },
            { originalName: name, sha256: await storage.sha256Of(file.path), storedPath: file.path },
          ),
        );
      }
      const calibration = recordRecorderCalibration({ db, sqlite, dataDir: env.DATA_DIR }, actor(req), inst, tones, fields);
      res.status(201).json({ id: calibration.id, offsetPpm: calibration.offsetPpm, offsetUncertaintyPpm: calibration.offsetUncertaintyPpm, validUntil: calibration.validUntil, calibration });
    } finally {
      // Accepted recordings were moved into the calibration store; whatever is left goes.
      for (const f of files) storage.discard(f.path);
    }
  });

  return r;
}

/** The header of a reference recording: a WAV (415 otherwise) of a length the analysis takes (422). */
async function checkReferenceHeader(filePath: string, size: number, name: string): Promise<void> {
  const handle = await open(filePath, "r");
  const head = new Uint8Array(Math.min(1 << 20, size));
  try {
    await handle.read(head, 0, head.length, 0);
  } finally {
    await handle.close();
  }
  try {
    const header = readWavHeader(head, { fileSize: size });
    if (header.durationS > MAX_REFERENCE_S) {
      throw new HttpError(422, "unprocessable", `“${name}” is ${Math.round(header.durationS)} s long; a reference recording of 5–30 s is enough (at most ${MAX_REFERENCE_S} s). Trim it and upload again.`, { audio: "Too long" });
    }
  } catch (error) {
    if (error instanceof AnalysisInputError) {
      const status = error.code === "not_wav" ? 415 : 422;
      throw new HttpError(status, status === 415 ? "unsupported_media_type" : "unprocessable", `“${name}”: ${error.message}`, { audio: error.message });
    }
    throw error;
  }
}
