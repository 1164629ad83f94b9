/**
 * Upload one or many WAV strikes to a unit: each file is its own request with its own progress
 * bar; once accepted, the strike appears in the list below as queued and moves on by polling.
 */
import { useRef, useState, type ReactNode } from "react";
import type { Support } from "@shared/schemas/spec";
import { InputField } from "@/components/ui/field";
import { InstrumentSelects, instrumentsToSend, type InstrumentOption } from "@/components/upload/instrument-select";
import { SupportSelect } from "@/components/upload/support-select";
import { UploadList, useUploadItems } from "@/components/upload/upload-list";
import { WavDropArea } from "@/components/upload/wav-drop-area";
import { isApiError } from "@/lib/api-client";
import { formatBytes } from "@/lib/format";
import { useInstrumentChoice } from "@/lib/instrument-choice";
import { useUploadStrike } from "../api/upload-strike";

type Props = {
  workshopId: string;
  unitId: string;
  /** The signed-in person (the instrument choice is remembered per person) and the workshop's instruments. */
  userId: string;
  instruments: InstrumentOption[];
  disabled?: boolean;
  disabledReason?: string;
  /** A slot for recording in the browser; the File it gives goes through the same upload. */
  recorder?: (addFile: (file: File) => void, disabled: boolean) => ReactNode;
};

export function StrikeUpload({ workshopId, unitId, userId, instruments, disabled = false, disabledReason, recorder }: Props) {
  const upload = useUploadStrike(workshopId, unitId);
  const { items, patch, enqueue } = useUploadItems();
  const [temperature, setTemperature] = useState("");
  const [temperatureError, setTemperatureError] = useState<string | null>(null);
  const [support, setSupport] = useState<Support | "">("");
  const [choice, choose] = useInstrumentChoice(userId, workshopId);
  const queue = useRef<Promise<void>>(Promise.resolve());

  const add = (files: File[]) => {
    if (disabled || files.length === 0) return;
    const t = temperature.trim();
    const temperatureC = t === "" ? null : Number(t.replace(",", "."));
    if (temperatureC !== null && (!Number.isFinite(temperatureC) || temperatureC < -30 || temperatureC > 70)) {
      setTemperatureError("Give the temperature as a number between −30 and 70 °C, or leave it empty.");
      return;
    }
    setTemperatureError(null);
    const fresh = enqueue(files);
    // Files go one after the other (the server takes one file per request); the chain keeps order
    // across several drops.
    fresh.forEach((item, i) => {
      queue.current = queue.current.then(async () => {
        patch(item.key, { state: "uploading" });
        try {
          await upload.mutateAsync({
            file: files[i],
            temperatureC,
            support: support || null,
            ...instrumentsToSend(instruments, choice, temperatureC),
            onProgress: ({ loaded, total }) => patch(item.key, { progress: total ? loaded / total : 0 }),
          });
          patch(item.key, { state: "accepted", progress: 1 });
        } catch (error) {
          patch(item.key, { state: "refused", error: isApiError(error) ? error.message : "The upload failed. Check the connection and try again." });
        }
      });
    });
  };

  return (
    <div className="flex flex-col gap-4">
      {disabled && disabledReason ? <p className="text-ink-soft">{disabledReason}</p> : null}
      <div className="grid gap-3 sm:grid-cols-2">
        <InputField
          label="Ambient temperature (°C, optional)"
          type="number"
          step="any"
          inputMode="decimal"
          value={temperature}
          disabled={disabled}
          error={temperatureError ?? undefined}
          hint="Frequencies are corrected to the specification's reference temperature."
          onChange={(e) => setTemperature(e.target.value)}
        />
        <SupportSelect label="Support condition (optional)" value={support} onChange={setSupport} disabled={disabled} />
        <InstrumentSelects instruments={instruments} value={choice} onChange={choose} disabled={disabled} temperatureGiven={temperature.trim() !== ""} />
      </div>
      <WavDropArea title="Drop WAV recordings of this unit here" hint="One strike or several per file; up to 100 MB each." inputLabel="WAV recordings for this unit" disabled={disabled} onFiles={add}>
        {recorder ? <div className="w-full max-w-xl text-left">{recorder((file) => add([file]), disabled)}</div> : null}
      </WavDropArea>
      <UploadList
        label="Uploads"
        items={items}
        status={(item) => (
          <span className="block text-caption text-ink-soft">
            {formatBytes(item.size)} ·{" "}
            {item.state === "waiting" ? "waiting…" : item.state === "uploading" ? `uploading ${Math.round(item.progress * 100)} %` : "uploaded; see its analysis below"}
          </span>
        )}
      />
    </div>
  );
}
