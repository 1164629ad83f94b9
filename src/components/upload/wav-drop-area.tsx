/**
 * A drop target and file picker for WAV recordings, used by the unit page and the batch page.
 * The caller decides where the files go; this only hands them over (nothing while disabled).
 */
import clsx from "clsx";
import { useRef, useState, type DragEvent, type ReactNode } from "react";
import { Button } from "@/components/ui/button";

type Props = {
  title: string;
  hint: ReactNode;
  /** Accessible name of the hidden file input (what a screen reader and the browser tests find). */
  inputLabel: string;
  disabled?: boolean;
  onFiles: (files: File[]) => void;
  /** Shown below the picker button, inside the drop area (e.g. the in-browser recorder). */
  children?: ReactNode;
};

export function WavDropArea({ title, hint, inputLabel, disabled = false, onFiles, children }: Props) {
  const [dragging, setDragging] = useState(false);
  const input = useRef<HTMLInputElement>(null);

  const onDrop = (event: DragEvent) => {
    event.preventDefault();
    setDragging(false);
    if (disabled) return;
    onFiles(Array.from(event.dataTransfer.files));
  };

  return (
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
      <p className="text-lead font-semibold">{title}</p>
      <p className="max-w-prose text-caption text-ink-soft">{hint}</p>
      <input
        ref={input}
        type="file"
        accept=".wav,audio/wav,audio/x-wav,audio/wave"
        multiple
        className="sr-only"
        aria-label={inputLabel}
        disabled={disabled}
        onChange={(event) => {
          onFiles(Array.from(event.target.files ?? []));
          event.target.value = "";
        }}
      />
      <div className="flex flex-wrap justify-center gap-2">
        <Button variant="secondary" onClick={() => input.current?.click()} disabled={disabled}>
          Choose files…
        </Button>
      </div>
      {children}
    </div>
  );
}
