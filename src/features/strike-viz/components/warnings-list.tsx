import type { AnalysisWarning } from "@shared/schemas/analysis";
import { Alert } from "@/components/ui/alert";

/** What each warning means in plain words, and what to do about it at the bench. */
const advice: Record<AnalysisWarning["code"], { title: string; todo: string }> = {
  clipped: {
    title: "The recording clipped",
    todo: "Turn the input gain down (or move the microphone back) until the loudest strike stays below full scale, then record again. Clipping adds partials that are not in the metal.",
  },
  flat_topped: {
    title: "The recording clipped below full scale",
    todo: "Lower the input gain until the loudest strike peaks around −12 dBFS, switch off any limiter or automatic gain control, and record again. Turning a clipped file down afterwards does not undo the clipping.",
  },
  not_exponential: {
    title: "A decay is not exponential",
    todo: "Check that nothing touches the unit while it rings (fingers, a loose clamp, a cable), strike it on its usual support, and upload the recording as it was made, without a fade-out or other editing.",
  },
  early_decay_overlap: {
    title: "An early decay hides the unit's own",
    todo: "Record with the microphone a hand's width from the unit, away from walls and hard benches, and let the unit ring freely.",
  },
  reverberant_room: {
    title: "The room rings as long as some partials",
    todo: "Bring the microphone to a hand's width from the unit, or soften the room around the bench with blankets or foam panels, and strike again.",
  },
  low_level: {
    title: "The level is very low",
    todo: "Move the microphone closer or raise the input gain so the strike peaks well above the room noise; frequencies and decay times get less certain in the noise.",
  },
  dc_offset: {
    title: "The signal sits off zero (DC offset)",
    todo: "The analysis removed it, but it usually points to a faulty interface or cable. Check the recording chain before the next strikes.",
  },
  hum: {
    title: "Mains hum in the recording",
    todo: "The hum lines were recognised and ignored. To lower them, move away from motors and lights, use a balanced cable, or run the recorder on battery.",
  },
  low_sample_rate: {
    title: "The sample rate is low",
    todo: "Upper partials above half the sample rate cannot be seen. Record at 44.1 kHz or more.",
  },
  tau_unreliable: {
    title: "A decay time is unreliable",
    todo: "A partial fell by less than 3 dB within the recording. Let the recording run until the ring has died away into the room noise.",
  },
  noise_only: {
    title: "Only noise was found",
    todo: "No strike stood clear of the noise. Check the microphone is connected and pointed at the unit, strike it firmly, and record again.",
  },
  channels_disagree: {
    title: "The channels disagree",
    todo: "The two channels of this file look like different signals. Record in mono, or check that both microphones are on the same unit.",
  },
  short_recording: {
    title: "The recording is short",
    todo: "Keep recording until the ring has decayed; a short file limits the frequency resolution and the decay fit.",
  },
  no_partials: {
    title: "No partials stood clear of the noise",
    todo: "Strike the unit firmly, hold or support it so it rings freely, and record again closer to it.",
  },
};

export function WarningsList({ warnings }: { warnings: AnalysisWarning[] }) {
  if (!warnings.length) return null;
  return (
    <ul className="flex flex-col gap-2" aria-label="Warnings about this recording">
      {warnings.map((w, i) => {
        const a = advice[w.code] ?? { title: w.code, todo: "" };
        return (
          <li key={`${w.code}-${i}`}>
            <Alert tone="caution" title={a.title}>
              <p>{w.message}</p>
              {a.todo ? <p className="mt-1"><span className="font-semibold">What to do: </span>{a.todo}</p> : null}
            </Alert>
          </li>
        );
      })}
    </ul>
  );
}
