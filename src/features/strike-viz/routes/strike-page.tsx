/**
 * The strike page (/strikes/:strikeId): the sound and the curves its numbers came from —
 * waveform with playback, spectrum with the partials marked, one decay plot per partial, the
 * partials table and the warnings. Queued and analysing strikes poll until done; a failed strike
 * shows its waveform and the reason; a strike without partials says so.
 */
import { SERIES_WORDS } from "@shared/strike-note";
import { useMemo, useState } from "react";
import { Link, useParams } from "react-router";
import { cents } from "@shared/physics";
import type { StrikeDetail, StrikeNoteReading } from "@shared/schemas/strike";
import { nearestNote } from "@shared/tuning";
import { supportLabels } from "@shared/schemas/spec";
import { strikeStateLabels } from "@shared/schemas/strike";
import { t60ExtrapolatedFrom } from "@shared/physics";
import { Alert } from "@/components/ui/alert";
import { Badge, EmptyState, PageHeader, Panel } from "@/components/ui/panel";
import { Spinner } from "@/components/ui/spinner";
import { paths } from "@/config/paths";
import { isApiError } from "@/lib/api-client";
import { useMe } from "@/lib/auth";
import { formatDateTime } from "@/lib/format";
import { useStrike } from "../api/get-strike";
import { useUnit } from "../api/get-unit";
import { DecayChart } from "../components/decay-chart";
import { PartialsTable } from "../components/partials-table";
import { SpectrumChart } from "../components/spectrum-chart";
import { StrikeCorrection } from "../components/strike-correction";
import { WarningsList } from "../components/warnings-list";
import { Waveform } from "../components/waveform";
import { fixed, formatHz, signed, withUncertainty } from "../lib/format";
import { partialRows, type PartialRow } from "../lib/partial-rows";
import "../strike-viz.css";

export default function StrikePage() {
  const { strikeId = "" } = useParams();
  const me = useMe();
  const workshopId = me.data?.activeWorkshop?.id ?? "";
  const strike = useStrike(workshopId, strikeId);

  if (strike.isPending) {
    return (
      <div className="py-16 text-center">
        <Spinner label="Loading the strike…" />
      </div>
    );
  }
  if (strike.isError) {
    const status = isApiError(strike.error) ? strike.error.status : 0;
    return (
      <Alert tone="error" title={status === 404 ? "There is no such strike in this workshop" : "The strike could not be loaded"}>
        {isApiError(strike.error) ? strike.error.message : "Check the connection and reload the page."}
      </Alert>
    );
  }
  return <StrikeView workshopId={workshopId} strike={strike.data} />;
}

function StrikeView({ workshopId, strike }: { workshopId: string; strike: StrikeDetail }) {
  const unit = useUnit(workshopId, strike.unit.id);
  const result = strike.result;
  const strikes = result?.strikes ?? [];
  const [shown, setShown] = useState(0);
  const current = strikes[shown] ?? strikes[0];
  const onsets = useMemo(() => strikes.map((s) => s.onsetS), [strikes]);
  // Labels describe result.strikes[0]; the other strikes of a file get "partial n" names.
  const labels = useMemo(() => (shown === 0 ? strike.labels : {}), [shown, strike.labels]);
  const strikeNote = shown === 0 ? strike.strikeNote : null;
  const requirements = unit.data?.evaluation?.requirements ?? null;
  const strikeNoteIsFundamental = strikeNote !== null && requirements?.find((r) => r.isFundamental)?.label === strikeNote.label;
  const rows = useMemo(() => (current ? partialRows(current.partials, labels, requirements, strikeNote) : []), [current, labels, requirements, strikeNote]);
  const busy = strike.state === "queued" || strike.state === "analysing";
  const highestPartialHz = useMemo(() => {
    const all = strikes.flatMap((s) => s.partials.map((p) => p.frequencyHz));
    return all.length ? Math.max(...all) : null;
  }, [strikes]);

  return (
    <div className="tl-strike-page flex flex-col gap-6">
      <nav aria-label="Where this strike belongs" className="-mb-4 flex flex-wrap gap-x-4 text-caption">
        <Link className="font-medium text-steel-700 underline-offset-2 hover:underline" to={paths.app.unit.getHref(strike.unit.id)}>
          ← Unit {strike.unit.serial}
        </Link>
        <Link className="font-medium text-steel-700 underline-offset-2 hover:underline" to={paths.app.batch.getHref(strike.unit.batchId)}>
          Batch {strike.unit.batchCode}
        </Link>
      </nav>
      <PageHeader
        title={`Strike of ${strike.unit.serial}`}
        description={
          <>
            Batch {strike.unit.batchCode} · {strike.originalName} · uploaded {formatDateTime(strike.uploadedAt)}
            {strike.uploadedBy ? ` by ${strike.uploadedBy.name}` : ""}
          </>
        }
        actions={strike.voided ? <Badge>Voided</Badge> : <Badge tone={strike.state === "done" ? "moss" : strike.state === "failed" ? "rust" : "steel"}>{strikeStateLabels[strike.state]}</Badge>}
      />

      {strike.voided ? (
        <Alert tone="caution" title={`Voided ${formatDateTime(strike.voided.at)}${strike.voided.by ? ` by ${strike.voided.by.name}` : ""}`}>
          {strike.voided.reason} The strike stays in the record but is not part of the unit's evaluation.
        </Alert>
      ) : null}

      <dl className="grid grid-cols-2 gap-x-6 gap-y-2 text-body sm:grid-cols-4" aria-label="Recording">
        <Fact label="Sample rate" value={strike.sampleRate ? `${(strike.sampleRate / 1000).toLocaleString("en-GB")} kHz` : "–"} />
        <Fact label="Duration" value={strike.durationS !== null ? `${fixed(strike.durationS, 2)} s` : "–"} />
        <Fact label="Format" value={strike.bitsPerSample ? `${strike.bitsPerSample}-bit ${strike.encoding ?? ""}, ${strike.channels ?? "?"} ch` : "–"} />
        <Fact label="Support · temperature" value={`${strike.support ? supportLabels[strike.support] : "support not given"} · ${strike.temperatureC !== null ? `${strike.temperatureC} °C` : "no temperature"}`} />
      </dl>

      <Panel aria-labelledby="correction-heading">
        <h2 id="correction-heading" className="mb-3 text-title font-semibold">Instruments and correction</h2>
        <StrikeCorrection strike={strike} />
      </Panel>

      {busy ? (
        <Alert tone="info" title={strike.state === "queued" ? "Waiting for analysis" : "Analysing…"}>
          <span className="inline-flex items-center gap-2">
            <Spinner size="sm" /> This page updates by itself when the analysis is done; the charts appear then.
          </span>
        </Alert>
      ) : null}
      {strike.state === "failed" ? (
        <Alert tone="error" title="This recording could not be analysed">
          <p>{strike.failureReason ?? "The analysis gave no reason."}</p>
          <p className="mt-1">Listen to it below. Record the unit again, and upload the new file; this one stays on record.</p>
        </Alert>
      ) : null}

      <Panel aria-labelledby="waveform-heading">
        <h2 id="waveform-heading" className="mb-3 text-title font-semibold">Recording</h2>
        <Waveform
          workshopId={workshopId}
          strikeId={strike.id}
          onsetsS={onsets}
          sampleRate={strike.sampleRate}
          durationS={strike.durationS}
          highestPartialHz={highestPartialHz}
        />
      </Panel>

      {result ? <WarningsList warnings={result.warnings} /> : null}

      {strike.state === "done" && result ? (
        strikes.length === 0 ? (
          <EmptyState title="No strike was found in this recording">
            The file held sound, but no strike stood out of it. Strike the unit firmly near the microphone and upload a new recording.
          </EmptyState>
        ) : (
          <>
            {strikes.length > 1 ? (
              <fieldset className="flex flex-wrap items-center gap-2">
                <legend className="mb-1 text-caption font-semibold text-ink-soft">This file holds {strikes.length} strikes; show</legend>
                {strikes.map((s, i) => (
                  <label key={i} className={`cursor-pointer rounded-control border px-3 py-2 text-caption ${i === shown ? "border-steel-600 bg-steel-50 text-steel-800" : "border-line-strong"}`}>
                    <input type="radio" className="sr-only" name="strike" checked={i === shown} onChange={() => setShown(i)} />
                    Strike {i + 1} at {fixed(s.onsetS, 2)} s{i === 0 ? " (evaluated)" : ""}
                  </label>
                ))}
              </fieldset>
            ) : null}
            {current.partials.length === 0 ? (
              <EmptyState title="No partials stood clear of the noise">
                The analysis found the strike at {fixed(current.onsetS, 2)} s but no partial above the noise floor ({fixed(current.noiseFloorDb, 1)} dBFS).
                Strike harder or record closer, and check the unit rings freely on its support.
              </EmptyState>
            ) : (
              <>
                <Panel aria-labelledby="spectrum-heading">
                  <h2 id="spectrum-heading" className="mb-1 text-title font-semibold">Spectrum</h2>
                  <p className="mb-3 text-caption text-ink-faint">Magnitude of the analysed segment after the strike at {fixed(current.onsetS, 2)} s. Red lines: the reported partials.</p>
                  {current.plot ? (
                    <SpectrumChart spectrum={current.plot.spectrum} bands={current.plot.bands} humHz={current.plot.humHz} rows={rows} strikeNoteHz={strikeNote?.frequencyHz ?? null} />
                  ) : (
                    <p className="text-ink-soft">This strike was analysed before plot series were stored; analyse it again to see its spectrum.</p>
                  )}
                </Panel>

                {strikeNote ? <StrikeNotePanel note={strikeNote} rows={rows} referencePitchHz={strike.referencePitchHz} /> : null}

                <Panel aria-labelledby="partials-heading">
                  <h2 id="partials-heading" className="mb-3 text-title font-semibold">Partials</h2>
                  <PartialsTable rows={rows} strikeNote={strikeNote} strikeNoteIsFundamental={strikeNoteIsFundamental} />
                </Panel>

                <Panel aria-labelledby="decay-heading">
                  <h2 id="decay-heading" className="mb-1 text-title font-semibold">Decay of each partial</h2>
                  <p className="mb-4 text-caption text-ink-faint">Envelope level against time. A straight fit line in dB is an exponential decay; the slope gives τ.</p>
                  <div className="grid gap-6 lg:grid-cols-2">
                    {rows.map((row) => {
                      const envelope = current.plot?.envelopes[row.index];
                      return (
                        <section key={row.index} aria-label={`Decay of ${row.label}`} className="tl-decay-item min-w-0">
                          <h3 className="mb-1 text-body font-semibold">
                            {row.label} <span className="font-normal text-ink-soft">· {formatHz(row.partial.frequencyHz)} · T60 {fixed(row.partial.t60S, 2)} s{t60ExtrapolatedFrom(row.partial.observedDecayDb) ? ` (extrapolated ${t60ExtrapolatedFrom(row.partial.observedDecayDb)})` : ""}</span>
                          </h3>
                          {envelope ? <DecayChart partial={row.partial} envelope={envelope} label={row.label} /> : <p className="text-ink-soft">No envelope stored for this partial.</p>}
                        </section>
                      );
                    })}
                  </div>
                </Panel>
              </>
            )}
          </>
        )
      ) : null}
    </div>
  );
}

/**
 * The heard pitch of a tube, read from this strike: the strike note, the note it is nearest at the
 * spec's reference pitch, its target, and the partials of the 2 : 3 : 4 series it was read from.
 */
function StrikeNotePanel({ note, rows, referencePitchHz }: { note: StrikeNoteReading; rows: PartialRow[]; referencePitchHz: number }) {
  const near = nearestNote(note.frequencyHz, referencePitchHz);
  const offTarget = note.targetHz ? cents(note.frequencyHz, note.targetHz) : null;
  return (
    <Panel aria-labelledby="strike-note-heading">
      <h2 id="strike-note-heading" className="mb-1 text-title font-semibold">
        {note.label}
      </h2>
      <p className="mb-3 max-w-prose text-caption text-ink-faint">
        The pitch heard from a tube: the common fundamental of the partials that stand near {SERIES_WORDS}, about an octave below the lowest of them — the usual reading for tubular chimes.
      </p>
      <dl className="grid grid-cols-1 gap-x-6 gap-y-2 sm:grid-cols-3">
        <div>
          <dt className="text-caption text-ink-faint">Strike note of this strike</dt>
          <dd className="text-title font-semibold tabular-nums">{withUncertainty(note.frequencyHz, note.uncertaintyHz, "Hz", 3)}</dd>
          <dd className="text-caption text-ink-soft">± u (k = 1) from the partials' fits</dd>
        </div>
        <div>
          <dt className="text-caption text-ink-faint">Nearest note at A4 = {referencePitchHz} Hz</dt>
          <dd className="text-title font-semibold tabular-nums">
            {near.name} {signed(near.cents, 1)} cents
          </dd>
        </div>
        <div>
          <dt className="text-caption text-ink-faint">From the target</dt>
          <dd className="text-title font-semibold tabular-nums">{offTarget === null ? "no target" : `${signed(offTarget, 1)} cents`}</dd>
          {note.targetHz ? <dd className="text-caption text-ink-soft">target {formatHz(note.targetHz, 3)}; this strike alone, before temperature correction</dd> : null}
        </div>
      </dl>
      <h3 className="mb-1 mt-4 text-body font-semibold">Partials it was read from</h3>
      <ul className="flex flex-col gap-1" aria-label="Partials used for the strike note">
        {note.members.map((m) => {
          const row = rows.find((r) => r.index === m.index);
          return (
            <li key={m.index} className="tabular-nums">
              <span className="font-medium">{row?.label ?? `partial ${m.index + 1}`}</span> · {row ? formatHz(row.partial.frequencyHz, 2) : "–"} · {m.harmonic} × the strike note{" "}
              <span className="text-ink-soft">({signed(m.deviationCents, 1)} cents from it)</span>
            </li>
          );
        })}
      </ul>
      <p className="mt-2 text-caption text-ink-faint">Misfit of the three from an exact {SERIES_WORDS} series: {fixed(note.misfitCents, 1)} cents RMS.</p>
    </Panel>
  );
}

function Fact({ label, value }: { label: string; value: string }) {
  return (
    <div>
      <dt className="text-caption text-ink-faint">{label}</dt>
      <dd className="font-medium">{value}</dd>
    </div>
  );
}
