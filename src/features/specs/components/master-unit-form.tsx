/**
 * Specification from a master unit: QA strikes the workshop's reference part, records it, and
 * its measured partials become the draft's targets, which the editor below then shows for review.
 */
import { SERIES_WORDS } from "@shared/strike-note";
import { useRef, useState } from "react";
import { familyLabels, families, type Family } from "@shared/schemas/spec";
import { MAX_MASTER_PARTIALS, type MasterDraftResponse } from "@shared/schemas/master";
import { Alert } from "@/components/ui/alert";
import { Button } from "@/components/ui/button";
import { InputField, SelectField } from "@/components/ui/field";
import { isApiError } from "@/lib/api-client";
import { useCreateMasterDraft } from "../api/create-master-draft";

export function MasterUnitForm({ family: initialFamily, onDraft }: { family: Family; onDraft: (result: MasterDraftResponse) => void }) {
  const draft = useCreateMasterDraft();
  const [family, setFamily] = useState<Family>(initialFamily);
  const [file, setFile] = useState<File | null>(null);
  const picker = useRef<HTMLInputElement>(null);
  const [fields, setFields] = useState({ temperatureC: "", fundamentalToleranceCents: "5", partialToleranceCents: "15", maxPartials: "6" });
  const [errors, setErrors] = useState<Record<string, string>>({});
  const [message, setMessage] = useState<string | null>(null);

  const send = async () => {
    setErrors({});
    setMessage(null);
    if (!file) {
      setErrors({ audio: "Choose the WAV recording of the master unit." });
      return;
    }
    try {
      onDraft(await draft.mutateAsync({ file, family, ...fields }));
    } catch (error) {
      if (isApiError(error)) {
        setErrors(error.fields ?? {});
        setMessage(error.message);
      } else setMessage("Something went wrong. Try again.");
    }
  };
  const field = (name: keyof typeof fields) => ({
    value: fields[name],
    onChange: (event: { target: { value: string } }) => setFields((f) => ({ ...f, [name]: event.target.value })),
    error: errors[name],
  });

  return (
    <div className="flex flex-col gap-4" aria-label="From a master unit" role="group">
      <p className="max-w-prose text-ink-soft">
        Strike your reference part as you strike production units and record it. Its strongest partials become the targets — the fundamental (a bell's prime, a tube's strike note) in Hz,
        the others as ratios to it — with the tolerances below around them. Nothing is saved until you create the specification.
      </p>
      {message ? <Alert tone="error">{message}</Alert> : null}
      <div className="grid gap-4 sm:grid-cols-2">
        <SelectField label="Family of the master" value={family} onChange={(event) => setFamily(event.target.value as Family)} error={errors.family}>
          {families.map((f) => (
            <option key={f} value={f}>
              {familyLabels[f]}
            </option>
          ))}
        </SelectField>
        <div className="flex flex-col gap-1.5">
          <span className="text-caption font-semibold text-ink">Master recording (WAV)</span>
          <input
            ref={picker}
            type="file"
            accept=".wav,audio/wav,audio/x-wav,audio/wave"
            className="sr-only"
            aria-label="Master recording (WAV)"
            onChange={(event) => {
              setFile(event.target.files?.[0] ?? null);
              event.target.value = "";
            }}
          />
          <div className="flex flex-wrap items-center gap-3">
            <Button variant="secondary" onClick={() => picker.current?.click()}>
              Choose the recording…
            </Button>
            <span className="min-w-0 text-caption text-ink-soft [overflow-wrap:anywhere]">{file ? `${file.name}, ${(file.size / 1024).toFixed(0)} KiB` : "A few seconds of one strike and its ring."}</span>
          </div>
          {errors.audio ? <p className="text-caption font-medium text-rust-700">{errors.audio}</p> : null}
        </div>
        <InputField label="Temperature of the master (°C, optional)" type="number" step="any" inputMode="decimal" hint="Its frequencies are corrected to the reference temperature." {...field("temperatureC")} />
        <InputField label="Partials to take (most)" type="number" step="1" min={1} max={MAX_MASTER_PARTIALS} inputMode="numeric" hint="The strongest ones, at most 40 dB below the loudest." {...field("maxPartials")} />
        <InputField label="Tolerance on the fundamental (± cents)" type="number" step="any" inputMode="decimal" {...field("fundamentalToleranceCents")} />
        <InputField label="Tolerance on the other partials (± cents)" type="number" step="any" inputMode="decimal" {...field("partialToleranceCents")} />
      </div>
      <div>
        <Button onClick={send} pending={draft.isPending}>
          Make a draft from the master
        </Button>
      </div>
    </div>
  );
}

/** What the master showed and which partial became which target, above the editor. */
export function MasterSummary({ result }: { result: MasterDraftResponse }) {
  const { master } = result;
  return (
    <div className="flex flex-col gap-3">
      <p className="text-ink-soft">
        From <span className="font-medium text-ink">{master.fileName}</span> ({(master.sampleRate / 1000).toLocaleString("en-GB")} kHz, {master.durationS.toFixed(1)} s):{" "}
        {master.partials.filter((p) => p.label).length} of {master.partials.length} partials found became targets. Review them below, then create the specification.
      </p>
      {master.warnings.length ? (
        <Alert tone="caution" title="The recording has warnings">
          <ul className="list-disc pl-5">
            {master.warnings.map((w) => (
              <li key={w.code}>{w.message}</li>
            ))}
          </ul>
        </Alert>
      ) : null}
      <div className="overflow-x-auto">
        <table className="w-full text-left text-caption tabular-nums">
          <caption className="sr-only">Partials of the master</caption>
          <thead className="border-b border-line-strong text-ink-soft">
            <tr>
              <th scope="col" className="py-1.5 pr-3 text-right font-semibold">Frequency (Hz)</th>
              <th scope="col" className="py-1.5 pr-3 text-right font-semibold">Level (dBFS)</th>
              <th scope="col" className="py-1.5 pr-3 text-right font-semibold">T60 (s)</th>
              <th scope="col" className="py-1.5 pr-3 font-semibold">Became</th>
            </tr>
          </thead>
          <tbody className="divide-y divide-line">
            {master.partials.map((p, i) => (
              <tr key={i} className={p.label ? "" : "text-ink-faint"}>
                <td className="py-1.5 pr-3 text-right">{p.frequencyHz.toFixed(3)}</td>
                <td className="py-1.5 pr-3 text-right">{p.amplitudeDb.toFixed(1)}</td>
                <td className="py-1.5 pr-3 text-right">{p.t60S.toFixed(2)}</td>
                <td className="py-1.5 pr-3">{p.label ?? "not taken"}</td>
              </tr>
            ))}
          </tbody>
        </table>
      </div>
      {result.strikeNoteHz !== null ? <p className="text-caption text-ink-soft">Strike note of the master: {result.strikeNoteHz.toFixed(3)} Hz, read from the partials near {SERIES_WORDS}.</p> : null}
    </div>
  );
}
