/**
 * The recording as a waveform with playback, zoom and a time cursor (wavesurfer.js 8), the
 * detected strike onsets marked, and an optional spectrogram below it. The WAV is fetched once as
 * a Blob with the session cookie and decoded at its own sample rate, so the spectrogram reaches
 * the upper partials (wavesurfer decodes at 8 kHz unless told otherwise).
 */
import { useEffect, useRef, useState, type KeyboardEvent } from "react";
import WaveSurfer from "wavesurfer.js";
import HoverPlugin from "wavesurfer.js/dist/plugins/hover.esm.js";
import RegionsPlugin from "wavesurfer.js/dist/plugins/regions.esm.js";
import SpectrogramPlugin from "wavesurfer.js/dist/plugins/spectrogram.esm.js";
import TimelinePlugin from "wavesurfer.js/dist/plugins/timeline.esm.js";
import { Alert } from "@/components/ui/alert";
import { Button } from "@/components/ui/button";
import { Spinner } from "@/components/ui/spinner";
import { isApiError } from "@/lib/api-client";
import { useStrikeAudio } from "../api/get-strike-audio";
import { chartColours } from "../lib/colours";
import { spectrogramColourMap } from "../lib/spectrogram-colours";

/** Tick and label spacing of the time axis for a recording of `durationS` seconds. */
function timelineSteps(durationS: number) {
  if (durationS <= 2) return { timeInterval: 0.05, primaryLabelInterval: 0.5, secondaryLabelInterval: 0.25 };
  if (durationS <= 12) return { timeInterval: 0.1, primaryLabelInterval: 1, secondaryLabelInterval: 0.5 };
  if (durationS <= 60) return { timeInterval: 0.5, primaryLabelInterval: 5, secondaryLabelInterval: 1 };
  return { timeInterval: 5, primaryLabelInterval: 30, secondaryLabelInterval: 10 };
}

const ZOOM_STEPS = [0, 50, 100, 200, 400, 800, 1600] as const;

/** Room a time label needs right of its tick, CSS px ("12.5 s" at 11 px, plus its indent). */
const TIME_LABEL_PX = 40;

export function Waveform({
  workshopId,
  strikeId,
  onsetsS,
  sampleRate,
  durationS,
  highestPartialHz,
}: {
  workshopId: string;
  strikeId: string;
  /** Detected strike onsets, s from the file start. */
  onsetsS: number[];
  /** The file's sample rate, Hz (decoding rate for the spectrogram); null when not known. */
  sampleRate: number | null;
  durationS: number | null;
  /** Highest reported partial, Hz: the spectrogram shows up to half as much again above it. */
  highestPartialHz?: number | null;
}) {
  const audio = useStrikeAudio(workshopId, strikeId);
  const waveRef = useRef<HTMLDivElement>(null);
  const spectroRef = useRef<HTMLDivElement>(null);
  const wsRef = useRef<WaveSurfer | null>(null);
  const spectroPluginRef = useRef<SpectrogramPlugin | null>(null);
  const [ready, setReady] = useState(false);
  const [playing, setPlaying] = useState(false);
  const [time, setTime] = useState(0);
  const [duration, setDuration] = useState(durationS ?? 0);
  const [zoomIndex, setZoomIndex] = useState(0);
  const [showSpectrogram, setShowSpectrogram] = useState(true);
  const [decodeError, setDecodeError] = useState<string | null>(null);
  // Pixels per second of the drawn waveform, so the last time label is left out when it would run past the end.
  const pxPerSecond = useRef(0);

  useEffect(() => {
    const container = waveRef.current;
    const blob = audio.data;
    if (!container || !blob) return;
    setReady(false);
    setDecodeError(null);
    const regions = RegionsPlugin.create();
    const ws = WaveSurfer.create({
      container,
      height: 128,
      waveColor: chartColours.wave,
      progressColor: chartColours.waveProgress,
      cursorColor: chartColours.cursor,
      cursorWidth: 2,
      normalize: false,
      dragToSeek: true,
      // Decode at the file's own rate (capped: the browser resamples above 96 kHz anyway).
      sampleRate: sampleRate ? Math.min(sampleRate, 96_000) : 44_100,
      plugins: [
        regions,
        TimelinePlugin.create({
          height: 26,
          ...timelineSteps(durationS ?? 0),
          secondaryLabelOpacity: 0.7,
          formatTimeCallback: (s) => {
            const total = wsRef.current?.getDuration() || durationS || 0;
            const perSecond = pxPerSecond.current || container.clientWidth / Math.max(total, 1e-3);
            return (total - s) * perSecond < TIME_LABEL_PX ? "" : `${+s.toFixed(2)} s`;
          },
          style: { fontSize: "11px", lineHeight: "14px", color: chartColours.axis },
        }),
        HoverPlugin.create({
          lineColor: chartColours.cursor,
          lineWidth: 1,
          labelBackground: chartColours.ink,
          labelColor: "#fff",
          labelSize: "12px",
          formatTimeCallback: (s) => `${s.toFixed(3)} s`,
        }),
      ],
    });
    wsRef.current = ws;
    const unsubs = [
      ws.on("ready", (d) => {
        setDuration(d);
        setReady(true);
        onsetsS.forEach((onset, i) => {
          const label = document.createElement("span");
          label.textContent = onsetsS.length > 1 ? `strike ${i + 1}` : "strike";
          // The waveform lives in wavesurfer's shadow DOM, out of reach of the page's stylesheet: style inline.
          Object.assign(label.style, { display: "inline-block", whiteSpace: "nowrap", marginLeft: "3px", padding: "0 4px", fontSize: "11px", lineHeight: "15px", color: "#fff", background: "#8a5a0f", borderRadius: "2px" });
          regions.addRegion({ start: onset, content: label, color: chartColours.onset, drag: false, resize: false });
        });
      }),
      ws.on("timeupdate", (t) => setTime(t)),
      ws.on("play", () => setPlaying(true)),
      ws.on("pause", () => setPlaying(false)),
      ws.on("finish", () => setPlaying(false)),
      ws.on("error", (e) => setDecodeError(e instanceof Error ? e.message : String(e))),
    ];
    ws.loadBlob(blob).catch((e: unknown) => {
      if (e instanceof DOMException && e.name === "AbortError") return;
      setDecodeError(e instanceof Error ? e.message : String(e));
    });
    return () => {
      unsubs.forEach((u) => u());
      spectroPluginRef.current = null;
      ws.destroy();
      wsRef.current = null;
    };
  }, [audio.data, onsetsS, sampleRate, durationS]);

  // The spectrogram is a plugin registered on demand, so hiding it also frees its canvases.
  useEffect(() => {
    const ws = wsRef.current;
    const container = spectroRef.current;
    if (!ws || !ready || !container) return;
    if (showSpectrogram && !spectroPluginRef.current) {
      const nyquist = (sampleRate ? Math.min(sampleRate, 96_000) : 44_100) / 2;
      spectroPluginRef.current = ws.registerPlugin(
        SpectrogramPlugin.create({
          container,
          height: 160,
          labels: true,
          labelsBackground: "rgba(255,253,249,0.85)",
          labelsColor: chartColours.axis,
          labelsHzColor: chartColours.axis,
          fftSamples: 1024,
          windowFunc: "hann",
          scale: "linear",
          // Up to 1.5 × the highest partial (at least 2 kHz): the partials fill the view instead of its bottom strip.
          frequencyMax: Math.min(nyquist, highestPartialHz ? Math.max(2000, Math.ceil((highestPartialHz * 1.5) / 500) * 500) : 12_000),
          colorMap: spectrogramColourMap,
          // White point −20 dB, 70 dB of range: the ring shows, the room noise stays pale.
          gainDB: 20,
          rangeDB: 70,
        }),
      );
    } else if (!showSpectrogram && spectroPluginRef.current) {
      spectroPluginRef.current.destroy();
      spectroPluginRef.current = null;
    }
  }, [showSpectrogram, ready, sampleRate, highestPartialHz]);

  useEffect(() => {
    const ws = wsRef.current;
    const container = waveRef.current;
    if (!ws || !ready || !container) return;
    pxPerSecond.current = Math.max(ZOOM_STEPS[zoomIndex], container.clientWidth / Math.max(ws.getDuration(), 1e-3));
    ws.zoom(ZOOM_STEPS[zoomIndex]);
  }, [zoomIndex, ready]);

  if (audio.isError) {
    return (
      <Alert tone="error" title="The recording could not be loaded">
        {isApiError(audio.error) ? audio.error.message : "Check the connection and reload the page."}
      </Alert>
    );
  }

  const togglePlay = () => void wsRef.current?.playPause();

  // The waveform is a slider for the keyboard: arrows move 10 ms (Shift: 100 ms), PageUp/PageDown
  // 1 s, Home/End to the ends, space plays and pauses.
  const onKey = (event: KeyboardEvent) => {
    const ws = wsRef.current;
    if (!ws || !ready) return;
    const step = event.shiftKey ? 0.1 : 0.01;
    const now = ws.getCurrentTime();
    const to: Record<string, number> = { ArrowLeft: now - step, ArrowRight: now + step, ArrowDown: now - step, ArrowUp: now + step, PageDown: now - 1, PageUp: now + 1, Home: 0, End: duration };
    if (event.key === " ") {
      event.preventDefault();
      togglePlay();
    } else if (event.key in to) {
      event.preventDefault();
      ws.setTime(Math.max(0, Math.min(duration, to[event.key])));
    }
  };

  return (
    <div className="flex flex-col gap-3">
      <div className="flex flex-wrap items-center gap-2" role="toolbar" aria-label="Playback and zoom">
        <Button onClick={togglePlay} disabled={!ready} aria-pressed={playing}>
          {playing ? "Pause" : "Play"}
        </Button>
        <Button variant="secondary" onClick={() => wsRef.current?.stop()} disabled={!ready}>
          Back to start
        </Button>
        <span className="mx-1 h-8 w-px bg-line" aria-hidden="true" />
        <Button variant="secondary" onClick={() => setZoomIndex((z) => Math.max(0, z - 1))} disabled={!ready || zoomIndex === 0} aria-label="Zoom out">
          −
        </Button>
        <span className="min-w-24 text-center text-caption text-ink-soft" aria-live="polite">
          {zoomIndex === 0 ? "Whole recording" : `${ZOOM_STEPS[zoomIndex]} px/s`}
        </span>
        <Button variant="secondary" onClick={() => setZoomIndex((z) => Math.min(ZOOM_STEPS.length - 1, z + 1))} disabled={!ready || zoomIndex === ZOOM_STEPS.length - 1} aria-label="Zoom in">
          +
        </Button>
        <span className="mx-1 h-8 w-px bg-line" aria-hidden="true" />
        <Button variant="quiet" onClick={() => setShowSpectrogram((s) => !s)} aria-pressed={showSpectrogram} disabled={!ready}>
          {showSpectrogram ? "Hide spectrogram" : "Show spectrogram"}
        </Button>
        <span className="ml-auto font-mono text-caption tabular-nums text-ink-soft" aria-label="Playback position">
          {time.toFixed(3)} s / {duration.toFixed(3)} s
        </span>
      </div>
      <div className="tl-waveform relative rounded-control border border-line bg-canvas px-1 pt-1">
        {!ready && !decodeError ? (
          <div className="absolute inset-0 z-10 flex items-center justify-center">
            <Spinner label={audio.isPending ? "Loading the recording…" : "Drawing the waveform…"} />
          </div>
        ) : null}
        <div
          ref={waveRef}
          data-testid="waveform"
          tabIndex={0}
          role="slider"
          aria-label="Play position in the recording (arrow keys move it, space plays)"
          aria-valuemin={0}
          aria-valuemax={Number(duration.toFixed(3))}
          aria-valuenow={Number(time.toFixed(3))}
          aria-valuetext={`${time.toFixed(3)} s of ${duration.toFixed(3)} s`}
          onKeyDown={onKey}
          className="rounded-control"
        />
      </div>
      {decodeError ? (
        <Alert tone="error" title="The browser could not decode this recording">
          {decodeError}. The stored file is unchanged; download it and open it in another player to check it.
        </Alert>
      ) : null}
      <div ref={spectroRef} data-testid="spectrogram" className={showSpectrogram ? "rounded-control border border-line" : "hidden"} aria-label="Spectrogram: time across, frequency up, darker is louder" />
      {onsetsS.length ? (
        <p className="text-caption text-ink-faint">
          Strike onsets marked at {onsetsS.map((s) => `${s.toFixed(3)} s`).join(", ")}.
        </p>
      ) : null}
    </div>
  );
}
