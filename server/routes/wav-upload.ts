/**
 * Receiving one WAV recording over multipart/form-data (field "audio"), shared by the strike
 * upload and the master-unit specification. Checked in this order, each with its own answer:
 * declared size (413 before the body is read), content type (415), disk and quota (507/413), the
 * multipart stream with its byte limit (413 mid-stream), then the RIFF/WAVE/fmt bytes (415) and the
 * format bounds (422). The file lands in DATA_DIR/incoming under a random name.
 */
import { randomUUID } from "node:crypto";
import { open } from "node:fs/promises";
import type { NextFunction, Request, Response } from "express";
import multer from "multer";
import { cleanStrings, stripControlCharacters } from "../../shared/text.ts";
import { AnalysisInputError } from "../analysis/errors.ts";
import { readWavHeader, type WavHeader } from "../analysis/wav.ts";
import { badRequest, HttpError } from "../http-error.ts";
import { workshopOf } from "../middleware/guards.ts";
import type { AppDeps } from "../app.ts";

const HEADER_BYTES = 1 << 20;
/** Upload policy on top of what the decoder accepts (readWavHeader already bounds channels and duration). */
const LIMITS = { minRate: 8000, maxRate: 384_000 };

export function wavUpload({ db, storage, env }: Pick<AppDeps, "db" | "storage" | "env">) {
  const limitBytes = env.UPLOAD_LIMIT_MB * 1024 * 1024;
  const tooLarge = () => new HttpError(413, "payload_too_large", `The recording is larger than the upload limit of ${env.UPLOAD_LIMIT_MB} MB. Trim it to the strike and its ring (a few seconds), then upload again.`);

  const receive = multer({
    storage: multer.diskStorage({ destination: storage.incoming, filename: (_req, _file, cb) => cb(null, `${randomUUID()}.part`) }),
    limits: { fileSize: limitBytes, files: 1, fields: 10, fieldSize: 1024, parts: 12 },
    // Browsers send the file name as UTF-8 bytes; read it so ("Stimmgabel-Ä.wav", "音叉.wav"), not as Latin-1.
    defParamCharset: "utf8",
  }).single("audio");

  /** Refuses before reading the body when it cannot fit; `more` adds a route's own check (a full queue). */
  const precheck =
    (more?: (req: Request) => void) =>
    (req: Request, _res: Response, next: NextFunction) => {
      const declared = Number(req.get("content-length") ?? 0);
      if (declared > limitBytes + 64 * 1024) return next(tooLarge());
      if (!(req.get("content-type") ?? "").startsWith("multipart/form-data")) {
        return next(new HttpError(415, "unsupported_media_type", "Send the recording as multipart/form-data with the WAV file in the field \"audio\"."));
      }
      try {
        storage.checkRoom(db, workshopOf(req).id, declared);
        more?.(req);
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

  /** The received file and its WAV header, or an HttpError saying what is wrong with it (the caller discards the file). */
  async function checkedFile(req: Request): Promise<{ file: Express.Multer.File; header: WavHeader }> {
    const file = req.file;
    if (!file) throw badRequest('Attach a WAV recording in the field "audio".', { audio: "No file received" });
    const handle = await open(file.path, "r");
    const head = new Uint8Array(Math.min(HEADER_BYTES, file.size));
    await handle.read(head, 0, head.length, 0);
    await handle.close();
    let header: WavHeader;
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
    return { file, header };
  }

  return { precheck, multipart, checkedFile };
}
