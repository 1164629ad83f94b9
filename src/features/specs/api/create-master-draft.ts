/** A master unit's recording to a draft specification (analysed on the server, nothing stored). */
import { useMutation } from "@tanstack/react-query";
import type { MasterDraftFields, MasterDraftResponse } from "@shared/schemas/master";
import { uploadForm, type UploadProgress } from "@/lib/upload";

export type MasterDraftInput = MasterDraftFields & { file: File; onProgress?: (progress: UploadProgress) => void };

export function createMasterDraft({ file, onProgress, ...fields }: MasterDraftInput): Promise<MasterDraftResponse> {
  const form = new FormData();
  for (const [key, value] of Object.entries(fields)) if (value !== undefined && value !== null && value !== "") form.append(key, String(value));
  form.append("audio", file, file.name);
  return uploadForm<MasterDraftResponse>("/api/specs/master-draft", form, onProgress);
}

export function useCreateMasterDraft() {
  return useMutation({ mutationFn: createMasterDraft });
}
