/** Turns anything thrown into the API's error shape; the client never sees a stack trace. */
import type { ErrorRequestHandler, RequestHandler } from "express";
import { ZodError } from "zod";
import { fieldMessages } from "../../shared/errors.ts";
import { HttpError } from "../http-error.ts";

export const apiNotFound: RequestHandler = (req, res) => {
  res.status(404).json({ error: { code: "not_found", message: `No API route ${req.method} ${req.path}.` } });
};

export const errorHandler: ErrorRequestHandler = (err, req, res, _next) => {
  if (res.headersSent) return;
  if (err instanceof HttpError) {
    return res.status(err.status).json({ error: { code: err.code, message: err.message, fields: err.fields } });
  }
  if (err instanceof ZodError) {
    const fields = fieldMessages(err);
    const names = Object.keys(fields).join(", ");
    return res.status(400).json({ error: { code: "validation_failed", message: `Please check: ${names}.`, fields } });
  }
  // body-parser: malformed JSON, wrong charset, body too large.
  if (err?.type === "entity.parse.failed") {
    return res.status(400).json({ error: { code: "bad_request", message: "The request body is not valid JSON." } });
  }
  if (err?.type === "entity.too.large") {
    return res.status(413).json({ error: { code: "payload_too_large", message: "The request body is too large." } });
  }
  req.log?.error({ err }, "unhandled error");
  res.status(500).json({ error: { code: "internal", message: "Something went wrong on the server. The error was logged; try again." } });
};
