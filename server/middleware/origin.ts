/**
 * CSRF defence for our own state-changing routes (better-auth checks its own): the Origin must be
 * one we trust, and bodies must be JSON — except multipart uploads, which are still Origin-checked.
 * A cross-site form post can send neither a trusted Origin nor application/json without CORS.
 */
import type { RequestHandler } from "express";
import { HttpError } from "../http-error.ts";

const SAFE = new Set(["GET", "HEAD", "OPTIONS"]);

export function sameOriginJson(trustedOrigins: string[]): RequestHandler {
  const trusted = new Set(trustedOrigins);
  return (req, _res, next) => {
    if (SAFE.has(req.method)) return next();
    const origin = req.get("origin");
    if (!origin || !trusted.has(origin)) {
      return next(new HttpError(403, "forbidden", "This request did not come from Tinelog's own pages (Origin not trusted)."));
    }
    const type = req.get("content-type") ?? "";
    const hasBody = Number(req.get("content-length") ?? 0) > 0 || req.get("transfer-encoding") !== undefined;
    if (type.startsWith("multipart/form-data") || type.startsWith("application/json") || !hasBody) return next();
    next(new HttpError(415, "unsupported_media_type", "Send the request body as JSON (Content-Type: application/json)."));
  };
}
