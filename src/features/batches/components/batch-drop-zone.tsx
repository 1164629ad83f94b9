/**
 * The quick path for a maker measuring a whole batch: drop many WAV files at once. Each file goes
 * to POST /api/batches/:id/strikes on its own (one file per request), where the server picks the
 * unit by the serial in the file name, else the next unmeasured one; the list says where each went.
 */
import clsx from "clsx";
import { useRef, useState, type DragEvent } from "react";
import { Link, useNavigate } from "react-router";
import { supportLabels, supports, type Support } from "@shared/schemas/spec";
import { Alert } from "@/components/ui/alert";
import { Button } from "@/components/ui/button";
import { InputField, SelectField } from "@/components/ui/field";
import { isApiError } from "@/lib/api-client";
import { getNextUnit } from "../api/get-next-unit";
import { useUploadBatchStrike, type BatchUploadAccepted } from "../api/upload-batch-strike";

type Item = { key: string; name: string; size: number; progress: number; state: "waiting" | "uploading" | "accepted" | "refused"; accepted?: BatchUploadAccepted; error?: string };

export function BatchDropZone({ workshopId, batchId, unitHref, disabled }: { workshopId: string; batchId: string; unitHref: (id: string) => string; disabled?: boolean }) {
  const upload = useUploadBatchStrike(workshopId, batchId);
  const [items, setItems] = useState<Item[]>([]);
  const [dragging, setDragging] = useState(false);
  const [temperature, setTemperature] = useState("");
  const [support, setSupport] = useState<Support | "">("");
  const input = useRef<HTMLInputElement>(null);
  const busy = items.some((item) => item.state === "waiting" || item.state === "uploading");

  const patch = (key: string, change: Partial<Item>) => setItems((all) => all.map((item) => (item.key === key ? { ...item, ...change } : item)));

  const start = async (files: File[]) => {
    if (files.length === 0) return;
    const temperatureC = temperature.trim() === "" ? null : Number(temperature);
    const batch: Item[] = files.map((file, i) => ({ key: `${Date.now()}-${i}-${file.name}`, name: file.name, size: file.size, progress: 0, state: "waiting" }));
    setItems((all) => [...batch, ...all]);
    // One after the other: "next unmeasured unit" must see the previous file's unit as measured.
    for (let i = 0; i < files.length; i++) {
      const key = batch[i].key;
      patch(key, { state: "uploading" });
      try {
        const accepted = await upload.mutateAsync({
          file: files[i],
          temperatureC: Number.isFinite(temperatureC) ? temperatureC : null,
          support: support || null,
          onProgress: ({ loaded, total }) => patch(key, { progress: total ? loaded / total : 0 }),
        });
        patch(key, { state: "accepted", progress: 1, accepted });
      } catch (error) {
        patch(key, { state: "refused", error: isApiError(error) ? error.message : "The upload failed. Try again." });
      }
    }
  };

  const onDrop = (event: DragEvent) => {
    event.preventDefault();
    setDragging(false);
    if (disabled) return;
    void start(Array.from(event.dataTransfer.files));
  };

  return (
    <div className="flex flex-col gap-4">
      <div className="grid gap-3 sm:grid-cols-2">
        <InputField label="Ambient temperature (°C, optional)" type="number" step="any" inputMode="decimal" value={temperature} onChange={(e) => setTemperature(e.target.value)} disabled={disabled} />
        <SelectField label="Support (optional)" value={support} onChange={(e) => setSupport(e.target.value as Support | "")} disabled={disabled}>
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
        <p className="text-lead font-semibold">Drop the batch's WAV files here</p>
        <p className="max-w-prose text-caption text-ink-soft">
          Name each file after its unit (e.g. F-0011-a.wav) and it goes to that unit; a file without a serial in its name goes to the next unit not yet measured.
        </p>
        <input
          ref={input}
          type="file"
          accept=".wav,audio/wav,audio/x-wav,audio/wave"
          multiple
          className="sr-only"
          aria-label="WAV files for the batch"
          disabled={disabled}
          onChange={(event) => {
            void start(Array.from(event.target.files ?? []));
            event.target.value = "";
          }}
        />
        <Button variant="secondary" onClick={() => input.current?.click()} disabled={disabled}>
          Choose files…
        </Button>
      </div>
      {items.length > 0 ? (
        <ul aria-label="Batch uploads" className="divide-y divide-line rounded-control border border-line">
          {items.map((item) => (
            <li key={item.key} className="flex flex-wrap items-center justify-between gap-3 px-4 py-3">
              <span className="min-w-0">
                <span className="block truncate font-medium">{item.name}</span>
                {item.state === "refused" ? (
                  <span role="alert" className="block text-caption text-rust-700">
                    {item.error}
                  </span>
                ) : item.accepted ? (
                  <span className="block text-caption text-ink-soft">
                    Went to{" "}
                    <Link to={unitHref(item.accepted.unitId)} className="font-semibold text-steel-700 underline underline-offset-2">
                      {item.accepted.serial}
                    </Link>{" "}
                    (matched by {item.accepted.matchedBy}); queued for analysis.
                  </span>
                ) : (
                  <span className="block text-caption text-ink-soft">{item.state === "waiting" ? "Waiting to upload…" : "Uploading…"}</span>
                )}
              </span>
              {item.state === "uploading" || item.state === "waiting" ? (
                <progress className="h-2 w-32 accent-steel-600" max={1} value={item.progress} aria-label={`Upload of ${item.name}`} />
              ) : null}
            </li>
          ))}
        </ul>
      ) : null}
      {busy ? <p className="text-caption text-ink-soft">Keep this page open until every file is uploaded.</p> : null}
    </div>
  );
}

/** Asks the server for the first unit with no strike yet and opens its page. */
export function MeasureNextUnitButton({ batchId, unitHref, disabled }: { batchId: string; unitHref: (id: string) => string; disabled?: boolean }) {
  const navigate = useNavigate();
  const [pending, setPending] = useState(false);
  const [message, setMessage] = useState<string | null>(null);
  return (
    <div className="flex flex-col gap-2">
      <Button
        pending={pending}
        disabled={disabled}
        onClick={async () => {
          setPending(true);
          setMessage(null);
          try {
            const next = await getNextUnit(batchId);
            if (next) navigate(unitHref(next.id));
            else setMessage("Every unit of this batch has at least one strike. Open a unit from the table to strike it again.");
          } catch (error) {
            setMessage(isApiError(error) ? error.message : "The next unit could not be found. Try again.");
          } finally {
            setPending(false);
          }
        }}
      >
        Measure next unit
      </Button>
      {message ? <Alert tone="info">{message}</Alert> : null}
    </div>
  );
}
