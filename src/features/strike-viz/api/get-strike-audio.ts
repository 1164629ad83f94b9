import { queryOptions, useQuery } from "@tanstack/react-query";
import { ApiError, fallbackMessage } from "@/lib/api-client";

/** The stored recording, for the URL of an audio element and for decoding (same-origin cookie). */
export const strikeAudioHref = (strikeId: string) => `/api/strikes/${encodeURIComponent(strikeId)}/audio`;

/**
 * Fetches the WAV as a Blob. The waveform needs the whole file decoded anyway, and fetching it
 * ourselves keeps the session cookie and gives a plain-words error instead of a silent player.
 */
export async function getStrikeAudio(strikeId: string, options: { signal?: AbortSignal } = {}): Promise<Blob> {
  let response: Response;
  try {
    response = await fetch(strikeAudioHref(strikeId), { credentials: "same-origin", signal: options.signal });
  } catch (cause) {
    if (cause instanceof DOMException && cause.name === "AbortError") throw cause;
    throw new ApiError(0, "network", fallbackMessage(0));
  }
  if (!response.ok) {
    let message = fallbackMessage(response.status);
    try {
      const body = (await response.json()) as { error?: { message?: string } };
      if (body.error?.message) message = body.error.message;
    } catch {
      // Not JSON: keep the message chosen by status.
    }
    throw new ApiError(response.status, `http_${response.status}`, message);
  }
  return response.blob();
}

export const getStrikeAudioQueryOptions = (workshopId: string, strikeId: string) =>
  queryOptions({
    queryKey: ["workshops", workshopId, "strikes", strikeId, "audio"],
    queryFn: ({ signal }) => getStrikeAudio(strikeId, { signal }),
    // A stored recording never changes (measurements are append-only).
    staleTime: Infinity,
    gcTime: 5 * 60_000,
  });

export function useStrikeAudio(workshopId: string, strikeId: string) {
  return useQuery(getStrikeAudioQueryOptions(workshopId, strikeId));
}
