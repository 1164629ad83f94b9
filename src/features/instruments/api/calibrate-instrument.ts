/**
 * A new calibration: a recorder's reference recordings as multipart with upload progress (the
 * server measures them before it answers), or a thermometer's certificate points as JSON.
 */
import { useMutation, useQueryClient } from "@tanstack/react-query";
import type { CalibrationCreated, ThermometerCalibrationInput } from "@shared/schemas/instrument";
import { api } from "@/lib/api-client";
import { uploadForm, type UploadProgress } from "@/lib/upload";
import { instrumentsKey } from "./get-instruments";

export type ReferenceTone = { file: File; referenceHz: number };
export type RecorderCalibrationInput = {
  tones: ReferenceTone[];
  referenceUncertaintyHz: number;
  referenceCertificate: string;
  referenceDescription?: string;
  calibratedOn?: string;
  note?: string;
  onProgress?: (progress: UploadProgress) => void;
};

/** Multipart body: one `referenceHz` per file in file order, the rest once for all files. */
export function recorderCalibrationForm(input: RecorderCalibrationInput): FormData {
  const form = new FormData();
  for (const t of input.tones) form.append("referenceHz", String(t.referenceHz));
  form.append("referenceUncertaintyHz", String(input.referenceUncertaintyHz));
  form.append("referenceCertificate", input.referenceCertificate);
  if (input.referenceDescription) form.append("referenceDescription", input.referenceDescription);
  if (input.calibratedOn) form.append("calibratedOn", input.calibratedOn);
  if (input.note) form.append("note", input.note);
  for (const t of input.tones) form.append("audio", t.file, t.file.name);
  return form;
}

export function calibrateRecorder(instrumentId: string, input: RecorderCalibrationInput): Promise<CalibrationCreated> {
  return uploadForm<CalibrationCreated>(`/api/instruments/${encodeURIComponent(instrumentId)}/calibrations`, recorderCalibrationForm(input), input.onProgress);
}

export function calibrateThermometer(instrumentId: string, input: ThermometerCalibrationInput): Promise<CalibrationCreated> {
  return api.post<CalibrationCreated>(`/api/instruments/${encodeURIComponent(instrumentId)}/calibrations`, input);
}

export function useCalibrateRecorder(workshopId: string, instrumentId: string) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (input: RecorderCalibrationInput) => calibrateRecorder(instrumentId, input),
    onSuccess: async () => {
      await queryClient.invalidateQueries({ queryKey: instrumentsKey(workshopId) });
      await queryClient.invalidateQueries({ queryKey: ["workshops", workshopId, "dashboard"] });
    },
  });
}

export function useCalibrateThermometer(workshopId: string, instrumentId: string) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (input: ThermometerCalibrationInput) => calibrateThermometer(instrumentId, input),
    onSuccess: async () => {
      await queryClient.invalidateQueries({ queryKey: instrumentsKey(workshopId) });
      await queryClient.invalidateQueries({ queryKey: ["workshops", workshopId, "dashboard"] });
    },
  });
}
