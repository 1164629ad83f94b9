import { useMutation, useQueryClient } from "@tanstack/react-query";
import { api } from "@/lib/api-client";
import { getWorkshopQueryOptions, type WorkshopProfile } from "./get-workshop";

export function updateProfile(profile: WorkshopProfile): Promise<{ ok: true }> {
  return api.put<{ ok: true }>("/api/workshop/profile", profile);
}

export function useUpdateProfile(workshopId: string) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: updateProfile,
    onSuccess: () => queryClient.invalidateQueries({ queryKey: getWorkshopQueryOptions(workshopId).queryKey }),
  });
}
