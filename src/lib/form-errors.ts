/** Puts the server's field messages next to the fields they belong to; the rest goes in a form alert. */
import type { FieldValues, Path, UseFormSetError } from "react-hook-form";
import { isApiError } from "./api-client";

export function applyServerErrors<T extends FieldValues>(error: unknown, setError: UseFormSetError<T>, known: readonly Path<T>[]): string | null {
  if (!isApiError(error)) return "Something went wrong. Try again.";
  let placed = false;
  for (const [field, message] of Object.entries(error.fields ?? {})) {
    if ((known as readonly string[]).includes(field)) {
      setError(field as Path<T>, { type: "server", message });
      placed = true;
    }
  }
  return placed && error.status === 400 ? null : error.message;
}
