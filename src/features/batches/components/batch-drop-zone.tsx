/**
 * The quick path for a maker measuring a whole batch: drop many WAV files at once. Each file goes
 * to POST /api/batches/:id/strikes on its own (one file per request), where the server picks the
 * unit by the serial in the file name, else the next unmeasured one; the list says where each went.
 */
import { useState } from "react";
import { Link, useNavigate } from "react-router";
import type { Support } from "@shared/schemas/spec";
import { Alert } from "@/components/ui/alert";
import { Button } from "@/components/ui/button";
import { InputField } from "@/components/ui/field";
import { InstrumentSelects, instrumentsToSend, type InstrumentOption } from "@/components/upload/instrument-select";
import { SupportSelect } from "@/components/upload/support-select";
import { UploadList, useUploadItems, type UploadItem } from "@/components/upload/upload-list";
import { WavDropArea } from "@/components/upload/wav-drop-area";
import { isApiError } from "@/lib/api-client";
import { useInstrumentChoice } from "@/lib/instrument-choice";
import { getNextUnit } from "../api/get-next-unit";
import { useUploadBatchStrike, type BatchUploadAccepted } from "../api/upload-batch-strike";

type Item = UploadItem & { accepted?: BatchUploadAccepted };

export function BatchDropZone({ workshopId, batchId, unitHref, disabled, userId, instruments }: { workshopId: string; batchId: string; unitHref: (id: string) => string; disabled?: boolean; userId: string; instruments: InstrumentOption[] }) {
  const upload = useUploadBatchStrike(workshopId, batchId);
  const { items, patch, enqueue } = useUploadItems<Item>();
  const [temperature, setTemperature] = useState("");
  const [support, setSupport] = useState<Support | "">("");
  const [choice, choose] = useInstrumentChoice(userId, workshopId);
  const busy = items.some((item) => item.state === "waiting" || item.state === "uploading");

  const start = async (files: File[]) => {
    if (files.length === 0) return;
    const parsed = temperature.trim() === "" ? null : Number(temperature);
    const temperatureC = parsed !== null && Number.isFinite(parsed) ? parsed : null;
    const batch = enqueue(files);
    // One after the other: "next unmeasured unit" must see the previous file's unit as measured.
    for (let i = 0; i < files.length; i++) {
      const key = batch[i].key;
      patch(key, { state: "uploading" });
      try {
        const accepted = await upload.mutateAsync({
          file: files[i],
          temperatureC,
          support: support || null,
          ...instrumentsToSend(instruments, choice, temperatureC),
          onProgress: ({ loaded, total }) => patch(key, { progress: total ? loaded / total : 0 }),
        });
        patch(key, { state: "accepted", progress: 1, accepted });
      } catch (error) {
        patch(key, { state: "refused", error: isApiError(error) ? error.message : "The upload failed. Try again." });
      }
    }
  };

  return (
    <div className="flex flex-col gap-4">
      <div className="grid gap-3 sm:grid-cols-2">
        <InputField label="Ambient temperature (°C, optional)" type="number" step="any" inputMode="decimal" value={temperature} onChange={(e) => setTemperature(e.target.value)} disabled={disabled} />
        <SupportSelect label="Support (optional)" value={support} onChange={setSupport} disabled={disabled} />
        <InstrumentSelects instruments={instruments} value={choice} onChange={choose} disabled={disabled} temperatureGiven={temperature.trim() !== ""} />
      </div>
      <WavDropArea
        title="Drop the batch's WAV files here"
        hint="Name each file after its unit (e.g. F-0011-a.wav) and it goes to that unit; a file without a serial in its name goes to the next unit not yet measured."
        inputLabel="WAV files for the batch"
        disabled={disabled}
        onFiles={(files) => void start(files)}
      />
      <UploadList
        label="Batch uploads"
        items={items}
        status={(item) =>
          item.accepted ? (
            <span className="block text-caption text-ink-soft">
              Went to{" "}
              <Link to={unitHref(item.accepted.unitId)} className="font-semibold text-steel-700 underline underline-offset-2">
                {item.accepted.serial}
              </Link>{" "}
              (matched by {item.accepted.matchedBy}); queued for analysis.
            </span>
          ) : (
            <span className="block text-caption text-ink-soft">{item.state === "waiting" ? "Waiting to upload…" : "Uploading…"}</span>
          )
        }
      />
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
