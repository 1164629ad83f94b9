/**
 * Multipart upload with progress. `fetch` cannot report upload progress, so this one request type
 * uses XMLHttpRequest (upload.onprogress); errors become the same `ApiError` as the JSON client's.
 */
import { errorBodySchema } from "@shared/errors";
import type { Support } from "@shared/schemas/spec";
import { ApiError, fallbackMessage } from "./api-client";

export type UploadProgress = { loaded: number; total: number };

export function uploadForm<T>(url: string, form: FormData, onProgress?: (progress: UploadProgress) => void, signal?: AbortSignal): Promise<T> {
  return new Promise<T>((resolve, reject) => {
    const xhr = new XMLHttpRequest();
    xhr.open("POST", url);
    xhr.withCredentials = true;
    xhr.setRequestHeader("Accept", "application/json");
    xhr.upload.onprogress = (event) => {
      if (event.lengthComputable) onProgress?.({ loaded: event.loaded, total: event.total });
    };
    xhr.onload = () => {
      let body: unknown = null;
      try {
        body = xhr.responseText ? JSON.parse(xhr.responseText) : null;
      } catch {
        // Not JSON: the status decides the message below.
      }
      if (xhr.status >= 200 && xhr.status < 300) return resolve(body as T);
      const parsed = errorBodySchema.safeParse(body);
      if (parsed.success) {
        const { code, message, fields } = parsed.data.error;
        return reject(new ApiError(xhr.status, code, message, fields));
      }
      reject(new ApiError(xhr.status, `http_${xhr.status}`, xhr.status === 415 ? "Tinelog accepts WAV recordings only." : fallbackMessage(xhr.status)));
    };
    xhr.onerror = () => reject(new ApiError(0, "network", fallbackMessage(0)));
    xhr.onabort = () => reject(new DOMException("The upload was cancelled.", "AbortError"));
    signal?.addEventListener("abort", () => xhr.abort(), { once: true });
    xhr.send(form);
  });
}

/** One WAV strike and the conditions it was recorded under, as the unit and batch uploads take it. */
export type StrikeUploadInput = {
  file: File;
  temperatureC?: number | null;
  support?: Support | null;
  /** The recorder it was recorded with, and the thermometer the temperature was read on. */
  recorderId?: string | null;
  thermometerId?: string | null;
  onProgress?: (progress: UploadProgress) => void;
};

/** The multipart body of a strike upload: optional temperature (°C), support and instruments, then the audio. */
export function strikeUploadForm({ file, temperatureC, support, recorderId, thermometerId }: StrikeUploadInput): FormData {
  const form = new FormData();
  if (temperatureC != null) form.append("temperatureC", String(temperatureC));
  if (support) form.append("support", support);
  if (recorderId) form.append("recorderId", recorderId);
  if (thermometerId) form.append("thermometerId", thermometerId);
  form.append("audio", file, file.name);
  return form;
}
