/**
 * Record a strike in the browser: a count-in that also measures the room noise,
 * an input level meter, a clipping warning while recording, automatic stop once the ring has
 * decayed back into the noise (or after a set time), preview playback, then the WAV goes to the
 * caller's upload path as a File. The microphone is asked for only when Record is pressed, and
 * released as soon as the take ends.
 */
import { useCallback, useEffect, useRef, useState } from "react";
import { Alert } from "@/components/ui/alert";
import { Button } from "@/components/ui/button";
import { SelectField } from "@/components/ui/field";
import type { MicrophoneSession } from "../lib/microphone";
import { RingWatch, medianDb, toDbfs } from "../lib/ring-watch";
import { LevelMeter } from "./level-meter";

/** A sample at or above this magnitude counts as clipped (within 0.01 dB of full scale). */
const CLIP_AT = 0.9989;
/** Seconds of the count-in kept before the strike, so the analysis sees the room noise too. */
const PRE_ROLL_S = 0.5;
const COUNT_IN_S = 3;

type Take = { file: File; url: string; durationS: number; peakDbfs: number; clipped: boolean; sampleRate: number; stoppedBy: "decay" | "time" | "user"; heardStrike: boolean };

type Phase =
  | { name: "idle" }
  | { name: "opening" }
  | { name: "count-in"; remaining: number }
  | { name: "recording"; ringing: boolean; elapsedS: number }
  | { name: "encoding" }
  | { name: "review"; take: Take }
  | { name: "sent"; fileName: string }
  | { name: "error"; message: string };

export function StrikeRecorder({ onRecorded, disabled }: { onRecorded: (file: File) => void; disabled?: boolean }) {
  const [phase, setPhase] = useState<Phase>({ name: "idle" });
  const [maxSeconds, setMaxSeconds] = useState(15);
  const [level, setLevel] = useState({ peakDb: -160, rmsDb: -160 });
  const [clipped, setClipped] = useState(false);
  const sessionRef = useRef<MicrophoneSession | null>(null);
  const cancelRef = useRef<(() => void) | null>(null);
  const urlRef = useRef<string | null>(null);

  const release = useCallback(async () => {
    cancelRef.current?.();
    cancelRef.current = null;
    const s = sessionRef.current;
    sessionRef.current = null;
    if (s) await s.close().catch(() => undefined);
  }, []);

  useEffect(
    () => () => {
      void release();
      if (urlRef.current) URL.revokeObjectURL(urlRef.current);
    },
    [release],
  );

  const start = async () => {
    if (urlRef.current) URL.revokeObjectURL(urlRef.current);
    urlRef.current = null;
    setClipped(false);
    setPhase({ name: "opening" });
    let session: MicrophoneSession;
    let encodeWav24: typeof import("../lib/wav-encode").encodeWav24;
    try {
      // The recorder's engine is its own chunk, fetched on the first press of Record.
      const [mic, wav] = await Promise.all([import("../lib/microphone"), import("../lib/wav-encode")]);
      encodeWav24 = wav.encodeWav24;
      try {
        session = await mic.openMicrophone();
      } catch (error) {
        setPhase({ name: "error", message: mic.explainMicrophoneError(error).message });
        return;
      }
    } catch {
      setPhase({ name: "error", message: "The recorder could not be loaded. Check the connection and press Record again." });
      return;
    }
    sessionRef.current = session;
    const rate = session.sampleRate;
    const blockS = 2048 / rate;
    const countInLevels: number[] = [];
    const preRoll: Float32Array[] = [];
    const chunks: Float32Array[] = [];
    let recording = false;
    let watch: RingWatch | null = null;
    let recordedS = 0;
    let peak = 0;
    let takeClipped = false;
    let finished = false;
    const startedAt = performance.now();
    let countInTimer = 0;

    const finish = async (stoppedBy: Take["stoppedBy"]) => {
      if (finished) return;
      finished = true;
      window.clearInterval(countInTimer);
      setPhase({ name: "encoding" });
      await release();
      const total = chunks.reduce((n, c) => n + c.length, 0);
      const all = new Float32Array(total);
      let o = 0;
      for (const c of chunks) {
        all.set(c, o);
        o += c.length;
      }
      try {
        const bytes = encodeWav24(all, rate);
        const stamp = new Date().toISOString().slice(0, 19).replace(/[-:]/g, "").replace("T", "-");
        const file = new File([bytes], `strike-${stamp}.wav`, { type: "audio/wav" });
        const url = URL.createObjectURL(file);
        urlRef.current = url;
        setPhase({
          name: "review",
          take: { file, url, durationS: total / rate, peakDbfs: toDbfs(peak), clipped: takeClipped, sampleRate: rate, stoppedBy, heardStrike: watch?.current !== "waiting" },
        });
      } catch (error) {
        setPhase({ name: "error", message: error instanceof Error ? error.message : "The recording could not be written as WAV." });
      }
    };

    session.onBlock((block) => {
      if (finished) return;
      const rmsDb = toDbfs(block.rms);
      setLevel({ peakDb: toDbfs(block.peak), rmsDb });
      if (!recording) {
        countInLevels.push(rmsDb);
        preRoll.push(block.samples);
        while (preRoll.length * blockS > PRE_ROLL_S) preRoll.shift();
        return;
      }
      chunks.push(block.samples);
      recordedS += blockS;
      if (block.peak > peak) peak = block.peak;
      if (block.peak >= CLIP_AT && !takeClipped) {
        takeClipped = true;
        setClipped(true);
      }
      const phaseNow = watch!.push(rmsDb);
      setPhase({ name: "recording", ringing: phaseNow !== "waiting", elapsedS: recordedS });
      if (phaseNow === "decayed") void finish("decay");
      else if (recordedS >= maxSeconds) void finish("time");
    });

    let remaining = COUNT_IN_S;
    setPhase({ name: "count-in", remaining });
    countInTimer = window.setInterval(() => {
      remaining = COUNT_IN_S - Math.floor((performance.now() - startedAt) / 1000);
      if (remaining > 0) {
        setPhase({ name: "count-in", remaining });
        return;
      }
      window.clearInterval(countInTimer);
      // Room noise: the median block level of the count-in after its first half second (the
      // first blocks can carry the click of the microphone opening).
      const settled = countInLevels.slice(Math.ceil(0.5 / blockS));
      const noiseDb = medianDb(settled.length ? settled : countInLevels.length ? countInLevels : [-100]);
      watch = new RingWatch({ noiseDb, blockS });
      for (const b of preRoll) chunks.push(b);
      recordedS = chunks.reduce((n, c) => n + c.length, 0) / rate;
      recording = true;
      setPhase({ name: "recording", ringing: false, elapsedS: recordedS });
    }, 100);
    cancelRef.current = () => {
      finished = true;
      window.clearInterval(countInTimer);
    };
    stopRef.current = () => {
      if (recording) void finish("user");
      else {
        void release();
        setPhase({ name: "idle" });
      }
    };
  };

  const stopRef = useRef<() => void>(() => undefined);
  const busy = phase.name === "opening" || phase.name === "count-in" || phase.name === "recording" || phase.name === "encoding";

  const discard = () => {
    if (urlRef.current) URL.revokeObjectURL(urlRef.current);
    urlRef.current = null;
    setPhase({ name: "idle" });
  };

  return (
    <section aria-labelledby="recorder-heading" className="tl-recorder flex flex-col gap-4 rounded-panel border border-line bg-surface p-4">
      <div className="flex flex-wrap items-end justify-between gap-3">
        <div>
          <h3 id="recorder-heading" className="text-body font-semibold">Record a strike</h3>
          <p className="text-caption text-ink-soft">
            Uncompressed WAV from this device's microphone. Press Record, keep still for the count-in (it measures the room), then strike the unit once. It stops by itself when the ring has died away.
          </p>
        </div>
        <div className="w-44">
          <SelectField label="Stop at the latest after" value={maxSeconds} onChange={(e) => setMaxSeconds(Number(e.target.value))} disabled={busy}>
            {[5, 10, 15, 20, 30, 60].map((s) => (
              <option key={s} value={s}>
                {s} s
              </option>
            ))}
          </SelectField>
        </div>
      </div>

      <div className="flex flex-wrap items-center gap-3">
        {busy ? (
          <Button variant="danger" onClick={() => stopRef.current()} disabled={phase.name === "encoding" || phase.name === "opening"}>
            {phase.name === "recording" ? "Stop now" : "Cancel"}
          </Button>
        ) : (
          <Button onClick={() => void start()} disabled={disabled}>
            <span aria-hidden="true" className="inline-block size-3 rounded-full bg-rust-300" />
            {phase.name === "review" ? "Record again" : phase.name === "sent" ? "Record another strike" : "Record"}
          </Button>
        )}
        <p className="text-body font-medium" aria-live="polite" role="status">
          {phase.name === "opening" && "Asking for the microphone…"}
          {phase.name === "count-in" && (
            <>
              Keep quiet: <span className="font-mono text-title tabular-nums">{phase.remaining}</span>
            </>
          )}
          {phase.name === "recording" && (phase.ringing ? `Ringing… ${phase.elapsedS.toFixed(1)} s — it stops when the ring is back in the noise` : `Strike the unit now (${phase.elapsedS.toFixed(1)} s)`)}
          {phase.name === "encoding" && "Writing the WAV…"}
          {phase.name === "sent" && `${phase.fileName} went to the uploads.`}
        </p>
      </div>

      {busy && phase.name !== "opening" ? <LevelMeter peakDb={level.peakDb} rmsDb={level.rmsDb} clipped={clipped} /> : null}
      {clipped && busy ? (
        <Alert tone="error" title="Clipping: the input is too loud">
          The microphone reached full scale, which adds partials that are not in the metal. Stop, turn the input gain down or move the microphone back, and record again.
        </Alert>
      ) : null}

      {phase.name === "error" ? (
        <Alert tone="error" title="Nothing was recorded">
          {phase.message}
        </Alert>
      ) : null}
      {disabled && phase.name === "idle" ? <p className="text-caption text-ink-faint">Recording is not available for this unit now.</p> : null}

      {phase.name === "review" ? (
        <div className="flex flex-col gap-3">
          <audio controls src={phase.take.url} className="w-full" aria-label="Preview of the recording" />
          <p className="text-caption text-ink-soft">
            {phase.take.durationS.toFixed(1)} s at {(phase.take.sampleRate / 1000).toLocaleString("en-GB")} kHz, 24-bit mono, peak {phase.take.peakDbfs.toFixed(1)} dBFS ·{" "}
            {phase.take.stoppedBy === "decay" ? "stopped when the ring had decayed" : phase.take.stoppedBy === "time" ? `stopped at the ${maxSeconds} s limit` : "stopped by hand"}.
          </p>
          {phase.take.clipped ? (
            <Alert tone="caution" title="This take clipped">
              Upload it only if nothing better is possible; its spectrum will carry partials that are not in the metal.
            </Alert>
          ) : null}
          {!phase.take.heardStrike ? (
            <Alert tone="caution" title="No strike was heard">
              The level never rose well above the room noise. Listen to the preview; record again closer to the unit if it is faint.
            </Alert>
          ) : null}
          {phase.take.peakDbfs < -40 && phase.take.heardStrike ? (
            <Alert tone="caution" title="The level is low">
              The strike peaked at {phase.take.peakDbfs.toFixed(1)} dBFS. Move the microphone closer or raise the gain for a clearer decay.
            </Alert>
          ) : null}
          <div className="flex flex-wrap gap-2">
            <Button
              onClick={() => {
                const take = phase.take;
                onRecorded(take.file);
                // The caller owns the file now; the preview URL is no longer needed.
                URL.revokeObjectURL(take.url);
                urlRef.current = null;
                setPhase({ name: "sent", fileName: take.file.name });
              }}
              disabled={disabled}
            >
              Use this recording
            </Button>
            <Button variant="quiet" onClick={discard}>
              Discard
            </Button>
          </div>
        </div>
      ) : null}
    </section>
  );
}
