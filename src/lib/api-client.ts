/**
 * The one way the client talks to Tinelog's own JSON API. Every non-2xx answer becomes an
 * `ApiError` carrying the server's `{ error: { code, message, fields? } }` (shared/errors.ts),
 * so forms can show field messages in place and error elements can branch on the status.
 */
import { errorBodySchema } from "@shared/errors";

export class ApiError extends Error {
  readonly status: number;
  readonly code: string;
  readonly fields: Record<string, string> | undefined;

  constructor(status: number, code: string, message: string, fields?: Record<string, string>) {
    super(message);
    this.name = "ApiError";
    this.status = status;
    this.code = code;
    this.fields = fields;
  }
}

export function isApiError(value: unknown): value is ApiError {
  return value instanceof ApiError;
}

/** Plain words for a status when the server sent no error body (a proxy page, a crash). */
export function fallbackMessage(status: number): string {
  switch (status) {
    case 0:
      return "Tinelog's server did not answer. Check the connection and try again.";
    case 400:
      return "The request was not accepted. Check the form and try again.";
    case 401:
      return "You are not signed in. Sign in and try again.";
    case 403:
      return "Your role in this workshop does not allow this.";
    case 404:
      return "This was not found. It may have been removed, or the link is wrong.";
    case 409:
      return "This conflicts with something that already exists.";
    case 413:
      return "The upload is too large.";
    case 429:
      return "Too many attempts in a short time. Wait a minute, then try again.";
    default:
      return status >= 500
        ? "Tinelog's server ran into a problem. Try again; if it keeps happening, tell the workshop owner."
        : `The request failed (HTTP ${status}).`;
  }
}

async function toApiError(response: Response): Promise<ApiError> {
  let body: unknown = null;
  try {
    body = await response.json();
  } catch {
    // Not JSON: fall back to a message chosen by status below.
  }
  const parsed = errorBodySchema.safeParse(body);
  if (parsed.success) {
    const { code, message, fields } = parsed.data.error;
    return new ApiError(response.status, code, message, fields);
  }
  return new ApiError(response.status, `http_${response.status}`, fallbackMessage(response.status));
}

type RequestOptions = { signal?: AbortSignal };

async function send(method: string, url: string, body: unknown, options: RequestOptions, accept: string): Promise<Response> {
  let response: Response;
  try {
    response = await fetch(url, {
      method,
      credentials: "same-origin",
      headers: {
        Accept: accept,
        ...(body === undefined ? {} : { "Content-Type": "application/json" }),
      },
      body: body === undefined ? undefined : JSON.stringify(body),
      signal: options.signal,
    });
  } catch (cause) {
    if (cause instanceof DOMException && cause.name === "AbortError") throw cause;
    throw new ApiError(0, "network", fallbackMessage(0));
  }
  if (!response.ok) throw await toApiError(response);
  return response;
}

async function json<T>(response: Response): Promise<T> {
  if (response.status === 204) return undefined as T;
  return (await response.json()) as T;
}

export const api = {
  get: async <T>(url: string, options: RequestOptions = {}) => json<T>(await send("GET", url, undefined, options, "application/json")),
  /** For endpoints that answer with a document (an e-mail's HTML part), not JSON. */
  getText: async (url: string, options: RequestOptions = {}) => (await send("GET", url, undefined, options, "text/html, text/plain")).text(),
  post: async <T>(url: string, body: unknown = {}, options: RequestOptions = {}) => json<T>(await send("POST", url, body, options, "application/json")),
  /** For endpoints that answer a JSON request with a file (a certificate preview PDF). */
  postForBlob: async (url: string, body: unknown = {}, accept = "application/pdf", options: RequestOptions = {}) => (await send("POST", url, body, options, `${accept}, application/json`)).blob(),
  /**
   * For endpoints that answer with one JSON value per line as the work goes on (NDJSON): calls
   * `onLine` for each as it arrives. A refusal before the work starts is an ApiError as usual.
   */
  postLines: async <T>(url: string, body: unknown, onLine: (value: T) => void, options: RequestOptions = {}) => {
    const response = await send("POST", url, body, options, "application/x-ndjson, application/json");
    const reader = response.body!.pipeThrough(new TextDecoderStream()).getReader();
    let buffered = "";
    for (;;) {
      const { value, done } = await reader.read();
      buffered += value ?? "";
      const lines = buffered.split("\n");
      buffered = done ? "" : lines.pop()!;
      for (const line of lines) if (line.trim()) onLine(JSON.parse(line) as T);
      if (done) return;
    }
  },
  put: async <T>(url: string, body: unknown = {}, options: RequestOptions = {}) => json<T>(await send("PUT", url, body, options, "application/json")),
  patch: async <T>(url: string, body: unknown = {}, options: RequestOptions = {}) => json<T>(await send("PATCH", url, body, options, "application/json")),
  delete: async <T>(url: string, options: RequestOptions = {}) => json<T>(await send("DELETE", url, undefined, options, "application/json")),
};
