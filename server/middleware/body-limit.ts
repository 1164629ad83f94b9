/**
 * Request-body limits in front of every route, the sign-in library's included. A declared
 * Content-Length over the limit is refused with 413 before a byte of the body is read, and the
 * connection is closed rather than drained. A body without a declared length (chunked) is counted
 * by whatever reads it: readAuthBody below, express.json with the JSON limit, or multer's upload limits.
 */
import type { RequestHandler } from "express";
import { HttpError } from "../http-error.ts";

export type BodyLimits = {
  /** /api/auth/*: sign-in, sign-up, profile and workshop bodies are a few hundred bytes. */
  authBytes: number;
  /** JSON bodies of our own API (a spec with its partials, up to 5,000 serials). */
  jsonBytes: number;
  /** multipart/form-data: the recording upload limit plus room for the other parts. */
  multipartBytes: number;
};

function limitFor(path: string, contentType: string, limits: BodyLimits): { bytes: number; message: string } {
  const generic = (bytes: number) => ({ bytes, message: `The request body is larger than ${Math.round(bytes / 1024)} kB, the most this address accepts.` });
  if (path.startsWith("/api/auth/") || path === "/api/auth") return generic(limits.authBytes);
  if (contentType.startsWith("multipart/form-data")) {
    // Uploads are recordings: say the limit in the unit the maker set it in, and what to do about it.
    const mb = Number(((limits.multipartBytes - MULTIPART_OVERHEAD_BYTES) / (1024 * 1024)).toFixed(2));
    return {
      bytes: limits.multipartBytes,
      message: `The upload is larger than the upload limit of ${mb} MB. Trim the recording to the strike and its ring (a few seconds), then upload again.`,
    };
  }
  return generic(limits.jsonBytes);
}

/** Room for the form's other parts (unit, support, notes) beside the recording itself. */
export const MULTIPART_OVERHEAD_BYTES = 64 * 1024;

export function refuseDeclaredOversize(limits: BodyLimits): RequestHandler {
  return (req, res, next) => {
    const declared = Number(req.get("content-length") ?? 0);
    const limit = limitFor(req.path, req.get("content-type") ?? "", limits);
    if (Number.isFinite(declared) && declared > limit.bytes) {
      // Answer without reading the body; closing stops Node from draining the rest of it.
      res.set("Connection", "close");
      return next(new HttpError(413, "payload_too_large", limit.message));
    }
    next();
  };
}

/**
 * Reads a sign-in library body into memory under the auth limit, then hands it on as text:
 * better-auth's Node adapter re-reads `req.body` once the stream has been consumed, parsing it by
 * its Content-Type as before. A chunked body that passes the limit is answered with 413 at once
 * (the connection closes), not after the client has finished sending it.
 */
export function readAuthBody(limits: BodyLimits): RequestHandler {
  return (req, res, next) => {
    const declared = Number(req.get("content-length") ?? 0);
    if (req.get("transfer-encoding") === undefined && !(declared > 0)) return next();
    const chunks: Buffer[] = [];
    let size = 0;
    let settled = false;
    req.on("data", (chunk: Buffer) => {
      if (settled) return;
      size += chunk.length;
      if (size > limits.authBytes) {
        settled = true;
        req.pause();
        res.set("Connection", "close");
        return next(new HttpError(413, "payload_too_large", `The request body is larger than ${Math.round(limits.authBytes / 1024)} kB, the most this address accepts.`));
      }
      chunks.push(chunk);
    });
    req.on("end", () => {
      if (settled) return;
      settled = true;
      req.body = Buffer.concat(chunks).toString("utf8");
      next();
    });
    req.on("error", (error) => {
      if (settled) return;
      settled = true;
      next(error);
    });
  };
}
