/** Sends a predicted-mode file with the mapping chosen in the preview (multipart field `modes`). */
import { useMutation, useQueryClient } from "@tanstack/react-query";
import type { ColumnMapping } from "@shared/mode-import";
import type { ModeList, ModelCondition } from "@shared/schemas/modes";
import { uploadForm } from "@/lib/upload";
import { modeMapKey } from "./get-mode-map";

export type ModeImportInput = {
  file: File;
  mapping: ColumnMapping;
  condition: ModelCondition;
  name: string;
  youngsModulusGPa: string;
  densityKgM3: string;
};

export type ModeImportResult = ModeList & { lists: ModeList[] };

export function importPredictedModes(specId: string, versionId: string, input: ModeImportInput): Promise<ModeImportResult> {
  const form = new FormData();
  form.append("condition", input.condition);
  if (input.name.trim()) form.append("name", input.name.trim());
  if (input.youngsModulusGPa.trim()) form.append("youngsModulusGPa", input.youngsModulusGPa.trim().replace(",", "."));
  if (input.densityKgM3.trim()) form.append("densityKgM3", input.densityKgM3.trim().replace(",", "."));
  form.append("mapping", JSON.stringify(input.mapping));
  form.append("modes", input.file, input.file.name);
  return uploadForm<ModeImportResult>(`/api/specs/${encodeURIComponent(specId)}/versions/${encodeURIComponent(versionId)}/predicted-modes`, form);
}

export function useImportPredictedModes(workshopId: string, specId: string, versionId: string) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (input: ModeImportInput) => importPredictedModes(specId, versionId, input),
    onSuccess: () => queryClient.invalidateQueries({ queryKey: modeMapKey(workshopId, specId) }),
  });
}
