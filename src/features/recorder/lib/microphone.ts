/**
 * The microphone side of the recorder, loaded on demand (a separate chunk: nobody pays for it
 * until they press Record). Opens the microphone with the browser's voice processing switched
 * off — echo cancellation, noise suppression and automatic gain would reshape the decay we are
 * measuring — and streams blocks of float samples from an AudioWorklet.
 */
// `no-inline`: Vite would inline a file this small as a data: URL, which the server's
// Content-Security-Policy (script-src 'self') rightly refuses to run as a worklet.
import workletUrl from "./capture-processor.js?url&no-inline";

export type Block = { samples: Float32Array; peak: number; rms: number };

export type MicrophoneSession = {
  sampleRate: number;
  /** The input device's name when the browser tells it (after permission). */
  deviceLabel: string;
  onBlock: (listener: (block: Block) => void) => void;
  close: () => Promise<void>;
};

/** Why the microphone could not be opened, in plain words with what to do. */
export class MicrophoneError extends Error {
  override name = "MicrophoneError";
  constructor(
    readonly kind: "denied" | "missing" | "busy" | "insecure" | "unsupported" | "other",
    message: string,
  ) {
    super(message);
  }
}

export function explainMicrophoneError(error: unknown): MicrophoneError {
  if (error instanceof MicrophoneError) return error;
  const name = error instanceof DOMException || error instanceof Error ? error.name : "";
  switch (name) {
    case "NotAllowedError":
    case "PermissionDeniedError":
      return new MicrophoneError(
        "denied",
        "Tinelog was not allowed to use the microphone, so nothing was recorded. Allow the microphone for this site in the browser's site settings (the icon beside the address), then press Record again — or upload a WAV file recorded elsewhere.",
      );
    case "NotFoundError":
    case "DevicesNotFoundError":
    case "OverconstrainedError":
      return new MicrophoneError(
        "missing",
        "No microphone was found. Connect one (or switch on the built-in one) and press Record again — or upload a WAV file recorded elsewhere.",
      );
    case "NotReadableError":
    case "TrackStartError":
      return new MicrophoneError("busy", "The microphone is in use by another program or could not be started. Close the other program, or unplug and reconnect the microphone, then press Record again.");
    case "SecurityError":
      return new MicrophoneError("insecure", "The browser allows the microphone only on a secure (https) address or on this computer itself. Open Tinelog over https to record here.");
    default:
      return new MicrophoneError("other", `The microphone could not be opened${error instanceof Error && error.message ? ` (${error.message})` : ""}. Press Record to try again, or upload a WAV file instead.`);
  }
}

export async function openMicrophone(): Promise<MicrophoneSession> {
  if (!window.isSecureContext) throw explainMicrophoneError(new DOMException("insecure", "SecurityError"));
  if (!navigator.mediaDevices?.getUserMedia || typeof AudioWorkletNode === "undefined") {
    throw new MicrophoneError("unsupported", "This browser cannot record from a microphone here. Use a current Chrome, Edge, Firefox or Safari, or upload a WAV file recorded elsewhere.");
  }
  let stream: MediaStream;
  try {
    stream = await navigator.mediaDevices.getUserMedia({
      audio: { echoCancellation: false, noiseSuppression: false, autoGainControl: false, channelCount: { ideal: 1 } },
    });
  } catch (error) {
    throw explainMicrophoneError(error);
  }
  const context = new AudioContext({ latencyHint: "interactive" });
  try {
    await context.audioWorklet.addModule(workletUrl);
    const source = context.createMediaStreamSource(stream);
    const node = new AudioWorkletNode(context, "tinelog-capture", { numberOfInputs: 1, numberOfOutputs: 1, outputChannelCount: [1] });
    // A silent path to the output keeps the graph pulling the worklet in every browser.
    const mute = context.createGain();
    mute.gain.value = 0;
    source.connect(node).connect(mute).connect(context.destination);
    if (context.state === "suspended") await context.resume();
    const listeners: ((b: Block) => void)[] = [];
    node.port.onmessage = (event: MessageEvent<Block>) => listeners.forEach((l) => l(event.data));
    return {
      sampleRate: context.sampleRate,
      deviceLabel: stream.getAudioTracks()[0]?.label ?? "",
      onBlock: (listener) => listeners.push(listener),
      close: async () => {
        node.port.onmessage = null;
        source.disconnect();
        node.disconnect();
        // Stopping the tracks turns the browser's "microphone in use" light off.
        stream.getTracks().forEach((t) => t.stop());
        await context.close();
      },
    };
  } catch (error) {
    stream.getTracks().forEach((t) => t.stop());
    await context.close().catch(() => undefined);
    throw explainMicrophoneError(error);
  }
}
