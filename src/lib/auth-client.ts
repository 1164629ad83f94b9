/**
 * better-auth's browser client, with the organization plugin typed by Tinelog's own access-control
 * statement (shared/permissions.ts). Components never call it directly: the query and mutation
 * hooks in lib/auth.ts and the features do, through `unwrap`, so its errors become `ApiError`s too.
 */
import { organizationClient } from "better-auth/client/plugins";
import { createAuthClient } from "better-auth/react";
import { ac, roles } from "@shared/permissions";
import { ApiError, fallbackMessage } from "./api-client";

export const authClient = createAuthClient({
  // Same origin: in development Vite proxies /api to the server, in production the server serves both.
  baseURL: typeof window === "undefined" ? "http://localhost" : window.location.origin,
  plugins: [organizationClient({ ac, roles })],
});

type AuthErrorLike = { status?: number; statusText?: string; code?: string; message?: string; fields?: Record<string, string> } | null | undefined;

/** The library names a new password `newPassword`; Tinelog's forms call the field `password`. */
function formFields(fields: Record<string, string> | undefined): Record<string, string> | undefined {
  if (!fields) return undefined;
  const out: Record<string, string> = {};
  for (const [key, message] of Object.entries(fields)) out[key === "newPassword" ? "password" : key] = message;
  return out;
}
type AuthResult<T> = { data: T | null; error: AuthErrorLike } | { data: T; error: null };

/** better-auth answers `{ data, error }`; we want a value or a thrown `ApiError`, like the rest of the API. */
export async function unwrap<T>(call: Promise<AuthResult<T>>): Promise<T> {
  let result: AuthResult<T>;
  try {
    result = await call;
  } catch (cause) {
    if (cause instanceof ApiError) throw cause;
    throw new ApiError(0, "network", fallbackMessage(0));
  }
  if (result.error) {
    const status = result.error.status ?? 500;
    const message = status === 429 ? fallbackMessage(429) : result.error.message || fallbackMessage(status);
    throw new ApiError(status, (result.error.code ?? `http_${status}`).toLowerCase(), message, formFields(result.error.fields));
  }
  return result.data as T;
}
