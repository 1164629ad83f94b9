/** Add units to a batch: a pasted list of serials or a range, counted in place before sending. */
import clsx from "clsx";
import type { FormEvent } from "react";
import { useState } from "react";
import { expandSerialRange, offsetSerial, SerialRangeError, splitSerialList } from "@shared/serials";
import { Alert } from "@/components/ui/alert";
import { Button } from "@/components/ui/button";
import { InputField, TextAreaField } from "@/components/ui/field";
import { useAddUnits } from "../api/add-units";

/**
 * `lastSerial` (the batch's last unit) and `remaining` (units still to add for the quantity) make
 * the placeholders the serials that come next, so the example is the batch's own.
 */
export function AddUnitsForm({ workshopId, batchId, lastSerial = null, remaining = 0 }: { workshopId: string; batchId: string; lastSerial?: string | null; remaining?: number }) {
  const add = useAddUnits(workshopId, batchId);
  const [mode, setMode] = useState<"range" | "list">("range");
  const [from, setFrom] = useState("");
  const [to, setTo] = useState("");
  const [list, setList] = useState("");
  const [added, setAdded] = useState<number | null>(null);

  const firstPlaceholder = (lastSerial && offsetSerial(lastSerial, 1)) || "F-0001";
  const lastPlaceholder = offsetSerial(from.trim() || firstPlaceholder, Math.max(1, remaining) - 1) ?? firstPlaceholder;

  let count = 0;
  let problem: string | null = null;
  if (mode === "range" && (from.trim() || to.trim())) {
    try {
      count = expandSerialRange(from, to).length;
    } catch (error) {
      problem = error instanceof SerialRangeError ? error.message : "This range cannot be read.";
    }
  }
  const parsed = splitSerialList(list);
  if (mode === "list") {
    count = parsed.serials.length;
    if (parsed.duplicates.length) problem = `Listed more than once: ${parsed.duplicates.slice(0, 10).join(", ")}. Remove the repeats.`;
  }

  const submit = async (event: FormEvent) => {
    event.preventDefault();
    setAdded(null);
    if (problem || count === 0) return;
    try {
      await add.mutateAsync(mode === "range" ? { range: { from: from.trim(), to: to.trim() } } : { serials: parsed.serials });
      setAdded(count);
      setFrom("");
      setTo("");
      setList("");
    } catch {
      // Shown from add.error below.
    }
  };

  return (
    <form onSubmit={submit} noValidate className="flex flex-col gap-3" aria-label="Add units">
      <div role="group" aria-label="Add by" className="inline-flex self-start rounded-control border border-line-strong p-0.5">
        {(["range", "list"] as const).map((option) => (
          <button
            key={option}
            type="button"
            aria-pressed={mode === option}
            onClick={() => setMode(option)}
            className={clsx("min-h-9 rounded-[0.4rem] px-3 text-caption font-medium", mode === option ? "bg-steel-600 text-white" : "text-ink-soft hover:bg-sunken")}
          >
            {option === "range" ? "Serial range" : "List of serials"}
          </button>
        ))}
      </div>
      {mode === "range" ? (
        <div className="grid gap-3 sm:grid-cols-2">
          <InputField label="First serial" placeholder={firstPlaceholder} value={from} onChange={(e) => setFrom(e.target.value)} />
          <InputField label="Last serial" placeholder={lastPlaceholder} value={to} onChange={(e) => setTo(e.target.value)} />
        </div>
      ) : (
        <TextAreaField label="Serials" hint="One per line, or separated by commas." rows={3} value={list} onChange={(e) => setList(e.target.value)} />
      )}
      <p role="status" className={clsx("text-caption", problem ? "font-medium text-rust-700" : "text-ink-soft")}>
        {problem ?? (count > 0 ? `${count} unit${count === 1 ? "" : "s"} will be added.` : "Nothing to add yet.")}
      </p>
      {add.isError ? <Alert tone="error">{add.error.message}</Alert> : null}
      {added !== null ? <Alert tone="success">{added} unit{added === 1 ? "" : "s"} added.</Alert> : null}
      <div>
        <Button type="submit" variant="secondary" pending={add.isPending} disabled={!!problem || count === 0}>
          Add {count > 0 ? count : ""} unit{count === 1 ? "" : "s"}
        </Button>
      </div>
    </form>
  );
}
