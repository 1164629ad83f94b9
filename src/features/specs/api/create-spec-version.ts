import { useMutation, useQueryClient } from "@tanstack/react-query";
import type { SpecDetail, SpecInput } from "@shared/schemas/spec";
import { api } from "@/lib/api-client";
import { specsKey } from "./get-specs";

/** Editing never changes a version in place: it appends a new, immutable one, so batches keep the version they were made under. */
export function createSpecVersion(id: string, input: SpecInput): Promise<SpecDetail> {
  return api.post<SpecDetail>(`/api/specs/${encodeURIComponent(id)}/versions`, input);
}

export function useCreateSpecVersion(workshopId: string, id: string) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (input: SpecInput) => createSpecVersion(id, input),
    onSuccess: (detail) => {
      queryClient.setQueryData([...specsKey(workshopId), id], detail);
      return queryClient.invalidateQueries({ queryKey: specsKey(workshopId) });
    },
  });
}
