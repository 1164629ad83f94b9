/**
 * Upload one or many WAV strikes to a unit: each file is its own request with its own progress
 * bar; once accepted, the strike appears in the list below as queued and moves on by polling.
 */
import clsx from "clsx";
import { useRef, useState, type DragEvent, type ReactNode } from "react";
import { supportLabels, supports, type Support } from "@shared/schemas/spec";
import { Button } from "@/components/ui/button";
import { InputField, SelectField } from "@/components/ui/field";
import { isApiError } from "@/lib/api-client";
import { formatBytes } from "@/lib/format";
import { useUploadStrike } from "../api/upload-strike";

type Item = { key: string; name: string; size: number; progress: number; state: "waiting" | "uploading" | "accepted" | "refused"; error?: string };

type Props = {
  workshopId: string;
  unitId: string;
  disabled?: boolean;
  disabledReason?: string;
  /** A slot for recording in the browser; the File it gives goes through the same upload. */
  recorder?: (addFile: (file: File) => void, disabled: boolean) => ReactNode;
};

export function StrikeUpload({ workshopId, unitId, disabled = false, disabledReason, recorder }: Props) {
  const upload = useUploadStrike(workshopId, unitId);
  const [items, setItems] = useState<Item[]>([]);
  const [dragging, setDragging] = useState(false);
  const [temperature, setTemperature] = useState("");
  const [temperatureError, setTemperatureError] = useState<string | null>(null);
  const [support, setSupport] = useState<Support | "">("");
  const input = useRef<HTMLInputElement>(null);
  const queue = useRef<Promise<void>>(Promise.resolve());

  const patch = (key: string, change: Partial<Item>) => setItems((all) => all.map((item) => (item.key === key ? { ...item, ...change } : item)));

  const add = (files: File[]) => {
    if (disabled || files.length === 0) return;
    const t = temperature.trim();
    const temperatureC = t === "" ? null : Number(t.replace(",", "."));
    if (temperatureC !== null && (!Number.isFinite(temperatureC) || temperatureC < -30 || temperatureC > 70)) {
      setTemperatureError("Give the temperature as a number between −30 and 70 °C, or leave it empty.");
      return;
    }
    setTemperatureError(null);
    const fresh: Item[] = files.map((file, i) => ({ key: `${Date.now()}-${i}-${file.name}`, name: file.name, size: file.size, progress: 0, state: "waiting" }));
    setItems((all) => [...fresh, ...all]);
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
            onProgress: ({ loaded, total }) => patch(item.key, { progress: total ? loaded / total : 0 }),
          });
          patch(item.key, { state: "accepted", progress: 1 });
        } catch (error) {
          patch(item.key, { state: "refused", error: isApiError(error) ? error.message : "The upload failed. Check the connection and try again." });
        }
      });
    });
  };

  const onDrop = (event: DragEvent) => {
    event.preventDefault();
    setDragging(false);
    add(Array.from(event.dataTransfer.files));
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
        <SelectField label="Support condition (optional)" value={support} disabled={disabled} onChange={(e) => setSupport(e.target.value as Support | "")}>
          <option value="">Not recorded</option>
          {supports.map((s) => (
            <option key={s} value={s}>
              {supportLabels[s]}
            </option>
          ))}
        </SelectField>
      </div>
      <div
        onDragOver={(event) => {
          event.preventDefault();
          if (!disabled) setDragging(true);
        }}
        onDragLeave={() => setDragging(false)}
        onDrop={onDrop}
        className={clsx(
          "flex flex-col items-center gap-3 rounded-panel border-2 border-dashed px-6 py-8 text-center",
          dragging ? "border-steel-500 bg-steel-50" : "border-line-strong bg-canvas",
          disabled && "opacity-60",
        )}
      >
        <p className="text-lead font-semibold">Drop WAV recordings of this unit here</p>
        <p className="text-caption text-ink-soft">One strike or several per file; up to 100 MB each.</p>
        <input
          ref={input}
          type="file"
          accept=".wav,audio/wav,audio/x-wav,audio/wave"
          multiple
          className="sr-only"
          aria-label="WAV recordings for this unit"
          disabled={disabled}
          onChange={(event) => {
            add(Array.from(event.target.files ?? []));
            event.target.value = "";
          }}
        />
        <div className="flex flex-wrap justify-center gap-2">
          <Button variant="secondary" onClick={() => input.current?.click()} disabled={disabled}>
            Choose files…
          </Button>
        </div>
        {recorder ? <div className="w-full max-w-xl text-left">{recorder((file) => add([file]), disabled)}</div> : null}
      </div>
      {items.length > 0 ? (
        <ul aria-label="Uploads" className="divide-y divide-line rounded-control border border-line">
          {items.map((item) => (
            <li key={item.key} className="flex flex-wrap items-center justify-between gap-3 px-4 py-3">
              <span className="min-w-0">
                <span className="block truncate font-medium">{item.name}</span>
                {item.state === "refused" ? (
                  <span role="alert" className="block text-caption text-rust-700">
                    {item.error}
                  </span>
                ) : (
                  <span className="block text-caption text-ink-soft">
                    {formatBytes(item.size)} ·{" "}
                    {item.state === "waiting" ? "waiting…" : item.state === "uploading" ? `uploading ${Math.round(item.progress * 100)} %` : "uploaded; see its analysis below"}
                  </span>
                )}
              </span>
              {item.state === "uploading" || item.state === "waiting" ? (
                <progress className="h-2 w-32 accent-steel-600" max={1} value={item.progress} aria-label={`Upload of ${item.name}`} />
              ) : null}
            </li>
          ))}
        </ul>
      ) : null}
    </div>
  );
}
