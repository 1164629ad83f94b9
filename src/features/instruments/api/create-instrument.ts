import { useMutation, useQueryClient } from "@tanstack/react-query";
import type { CreateInstrumentInput, InstrumentDetail } from "@shared/schemas/instrument";
import { api } from "@/lib/api-client";
import { instrumentsKey } from "./get-instruments";

export function createInstrument(input: CreateInstrumentInput): Promise<{ id: string; instrument: InstrumentDetail }> {
  return api.post<{ id: string; instrument: InstrumentDetail }>("/api/instruments", input);
}

export function useCreateInstrument(workshopId: string) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: createInstrument,
    onSuccess: async () => {
      await queryClient.invalidateQueries({ queryKey: instrumentsKey(workshopId) });
    },
  });
}
