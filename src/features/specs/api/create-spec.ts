import { useMutation, useQueryClient } from "@tanstack/react-query";
import type { SpecDetail, SpecInput } from "@shared/schemas/spec";
import { api } from "@/lib/api-client";
import { specsKey } from "./get-specs";

export function createSpec(input: SpecInput): Promise<SpecDetail> {
  return api.post<SpecDetail>("/api/specs", input);
}

export function useCreateSpec(workshopId: string) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: createSpec,
    onSuccess: () => queryClient.invalidateQueries({ queryKey: specsKey(workshopId) }),
  });
}
