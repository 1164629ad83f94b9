/**
 * Calibrate a recorder: record one or more reference tones with it (a signal generator, a frequency
 * counter's output, a certified reference fork), give each file its reference frequency and the
 * reference's uncertainty and certificate. The upload shows its progress; the server then measures
 * the tones with the same analysis as the strikes and answers with the clock offset.
 */
import { useState } from "react";
import type { CalibrationCreated } from "@shared/schemas/instrument";
import { Alert } from "@/components/ui/alert";
import { Button } from "@/components/ui/button";
import { InputField } from "@/components/ui/field";
import { WavDropArea } from "@/components/upload/wav-drop-area";
import { isApiError } from "@/lib/api-client";
import { formatBytes, formatDate, formatUncertainty } from "@/lib/format";
import { useCalibrateRecorder } from "../api/calibrate-instrument";
import { formatPpm } from "../lib/format";

type Row = { key: string; file: File; referenceHz: string };

/** "ref-1000Hz.wav", "440 Hz take 2.wav" → 1000, 440: the frequency in the name, if there is one. */
export function frequencyFromName(name: string): string {
  const m = /(\d+(?:[.,]\d+)?)\s*hz/i.exec(name);
  return m ? m[1].replace(",", ".") : "";
}

const today = () => new Date().toISOString().slice(0, 10);

export function RecorderCalibrationForm({ workshopId, instrumentId, onDone }: { workshopId: string; instrumentId: string; onDone?: (c: CalibrationCreated) => void }) {
  const calibrate = useCalibrateRecorder(workshopId, instrumentId);
  const [rows, setRows] = useState<Row[]>([]);
  const [uncertainty, setUncertainty] = useState("");
  const [certificate, setCertificate] = useState("");
  const [description, setDescription] = useState("");
  const [calibratedOn, setCalibratedOn] = useState(today());
  const [progress, setProgress] = useState<number | null>(null);
  const [errors, setErrors] = useState<Record<string, string>>({});
  const [failure, setFailure] = useState<string | null>(null);
  const [result, setResult] = useState<CalibrationCreated | null>(null);

  const addFiles = (files: File[]) => {
    setResult(null);
    setRows((all) => [...all, ...files.map((file, i) => ({ key: `${Date.now()}-${i}-${file.name}`, file, referenceHz: frequencyFromName(file.name) }))].slice(0, 8));
  };

  const submit = async () => {
    const found: Record<string, string> = {};
    if (rows.length === 0) found.audio = "Add the recording of at least one reference tone.";
    rows.forEach((r) => {
      const hz = Number(r.referenceHz.replace(",", "."));
      if (!(hz > 0)) found[`hz-${r.key}`] = "Give the reference frequency in Hz.";
    });
    const u = Number(uncertainty.replace(",", "."));
    if (!(u > 0)) found.referenceUncertaintyHz = "Give the reference's uncertainty in Hz, as on its certificate (greater than 0).";
    if (!certificate.trim()) found.referenceCertificate = "Give the reference's certificate number.";
    setErrors(found);
    setFailure(null);
    if (Object.keys(found).length) return;
    setProgress(0);
    try {
      const created = await calibrate.mutateAsync({
        tones: rows.map((r) => ({ file: r.file, referenceHz: Number(r.referenceHz.replace(",", ".")) })),
        referenceUncertaintyHz: u,
        referenceCertificate: certificate.trim(),
        referenceDescription: description.trim() || undefined,
        calibratedOn,
        onProgress: ({ loaded, total }) => setProgress(total ? loaded / total : 0),
      });
      setResult(created);
      setRows([]);
      onDone?.(created);
    } catch (error) {
      if (isApiError(error)) {
        setFailure(error.message);
        if (error.fields) setErrors(error.fields);
      } else setFailure("The calibration could not be sent. Check the connection and try again.");
    } finally {
      setProgress(null);
    }
  };

  const busy = progress !== null;
  return (
    <div className="flex flex-col gap-4">
      <WavDropArea
        title="Drop the reference recordings here"
        hint="One steady tone per file, recorded with this recorder at its usual settings: 5–30 s of a generator's or counter's output by cable, or a reference fork struck once close to the microphone. Up to 8 files, for example 440 Hz and 1 kHz."
        inputLabel="Reference recordings"
        disabled={busy}
        onFiles={addFiles}
      />
      {errors.audio ? <p className="text-caption font-medium text-rust-700">{errors.audio}</p> : null}
      {rows.length > 0 ? (
        <ul aria-label="Reference recordings to send" className="divide-y divide-line rounded-control border border-line">
          {rows.map((r, i) => (
            <li key={r.key} className="grid items-end gap-3 px-4 py-3 sm:grid-cols-[1fr_14rem_auto]">
              <span className="min-w-0 self-center">
                <span className="block truncate font-medium">{r.file.name}</span>
                <span className="text-caption text-ink-soft">{formatBytes(r.file.size)}</span>
              </span>
              <InputField
                label={`Reference frequency of file ${i + 1} (Hz)`}
                inputMode="decimal"
                value={r.referenceHz}
                disabled={busy}
                error={errors[`hz-${r.key}`]}
                onChange={(e) => setRows((all) => all.map((x) => (x.key === r.key ? { ...x, referenceHz: e.target.value } : x)))}
              />
              <Button variant="quiet" size="sm" disabled={busy} onClick={() => setRows((all) => all.filter((x) => x.key !== r.key))}>
                Remove
              </Button>
            </li>
          ))}
        </ul>
      ) : null}
      <div className="grid gap-4 sm:grid-cols-2 lg:grid-cols-4">
        <InputField label="Reference uncertainty U (Hz, k = 2)" inputMode="decimal" value={uncertainty} disabled={busy} error={errors.referenceUncertaintyHz} hint="As stated on the reference's certificate." onChange={(e) => setUncertainty(e.target.value)} />
        <InputField label="Reference certificate number" value={certificate} disabled={busy} error={errors.referenceCertificate} onChange={(e) => setCertificate(e.target.value)} />
        <InputField label="Reference (optional)" placeholder="e.g. signal generator SG-2" value={description} disabled={busy} onChange={(e) => setDescription(e.target.value)} />
        <InputField label="Recorded on" type="date" max={today()} value={calibratedOn} disabled={busy} error={errors.calibratedOn} onChange={(e) => setCalibratedOn(e.target.value)} />
      </div>
      <p className="text-caption text-ink-faint">
        A reference fork's frequency depends on its temperature: use it at the temperature its certificate states. Keep the recorder's settings (sample rate, any speed or pitch function off) as for the strikes.
      </p>
      <div className="flex flex-wrap items-center gap-3">
        <Button onClick={() => void submit()} pending={busy}>
          Calibrate
        </Button>
        {busy ? (
          <span className="flex items-center gap-2 text-caption text-ink-soft" role="status">
            <progress className="h-2 w-40 accent-steel-600" max={1} value={progress ?? 0} aria-label="Upload of the reference recordings" />
            {progress !== null && progress < 1 ? `uploading ${Math.round(progress * 100)} %` : "measuring the tones…"}
          </span>
        ) : null}
      </div>
      {failure ? (
        <Alert tone="error" title="Not calibrated">
          {failure}
        </Alert>
      ) : null}
      {result?.calibration ? (
        <Alert tone="success" title={`Calibration ${result.calibration.number} recorded`}>
          <p>
            Clock offset <strong className="tabular-nums">{formatPpm(result.offsetPpm)}</strong> ± {formatUncertainty(result.calibration.expandedOffsetUncertaintyPpm)} ppm (k = 2), valid until {formatDate(result.validUntil)}. Strikes recorded with this recorder from now on are corrected for it.
          </p>
          {result.calibration.warnings.map((w) => (
            <p key={w} className="mt-2 font-medium text-ochre-600">
              {w}
            </p>
          ))}
        </Alert>
      ) : null}
    </div>
  );
}
