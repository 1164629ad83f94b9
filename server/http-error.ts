/** An error that maps to an HTTP status and the API's error shape (shared/errors.ts). */
import type { ErrorCode } from "../shared/errors.ts";

export class HttpError extends Error {
  constructor(
    public readonly status: number,
    public readonly code: ErrorCode,
    message: string,
    public readonly fields?: Record<string, string>,
  ) {
    super(message);
    this.name = "HttpError";
  }
}

export const badRequest = (message: string, fields?: Record<string, string>) =>
  new HttpError(400, "validation_failed", message, fields);
export const unauthenticated = () => new HttpError(401, "unauthenticated", "Sign in to continue.");
export const forbidden = (message = "Your role in this workshop does not allow this.") =>
  new HttpError(403, "forbidden", message);
export const notFound = (what = "That record") => new HttpError(404, "not_found", `${what} was not found.`);
export const conflict = (message: string, fields?: Record<string, string>) => new HttpError(409, "conflict", message, fields);
