/** The one error vocabulary of the API: `{ error: { code, message, fields? } }`. */
import { z } from "zod";

export const errorCodes = [
  "bad_request",
  "validation_failed",
  "unauthenticated",
  "forbidden",
  "not_found",
  "conflict",
  "payload_too_large",
  "unsupported_media_type",
  "unprocessable",
  "too_many_requests",
  "busy",
  "insufficient_storage",
  "internal",
] as const;
export type ErrorCode = (typeof errorCodes)[number];

export const errorBodySchema = z.object({
  error: z.object({
    code: z.string(),
    message: z.string(),
    fields: z.record(z.string(), z.string()).optional(),
  }),
});
export type ErrorBody = z.infer<typeof errorBodySchema>;

/** Flattens a zod error into `{ "path.to.field": "message" }` for forms and API responses. */
export function fieldMessages(error: z.ZodError): Record<string, string> {
  const fields: Record<string, string> = {};
  for (const issue of error.issues) {
    const key = issue.path.length ? issue.path.join(".") : "_";
    if (!(key in fields)) fields[key] = issue.message;
  }
  return fields;
}
