/**
 * The recorder and thermometer a person last measured with, remembered in this browser for that
 * person and workshop: a shared bench computer keeps each maker's own choice, and a second
 * browser (a tablet at another bench) keeps its own.
 */
import { useCallback, useState } from "react";

export type InstrumentChoice = { recorderId: string; thermometerId: string };
const EMPTY: InstrumentChoice = { recorderId: "", thermometerId: "" };

export const instrumentChoiceKey = (userId: string, workshopId: string) => `tinelog.instruments.${userId}.${workshopId}`;

function read(key: string): InstrumentChoice {
  try {
    const raw = window.localStorage.getItem(key);
    if (!raw) return EMPTY;
    const v = JSON.parse(raw) as Partial<InstrumentChoice>;
    return { recorderId: typeof v.recorderId === "string" ? v.recorderId : "", thermometerId: typeof v.thermometerId === "string" ? v.thermometerId : "" };
  } catch {
    // Storage off (private mode) or a damaged entry: start empty.
    return EMPTY;
  }
}

export function useInstrumentChoice(userId: string, workshopId: string): [InstrumentChoice, (change: Partial<InstrumentChoice>) => void] {
  const key = instrumentChoiceKey(userId, workshopId);
  const [choice, setChoice] = useState<InstrumentChoice>(() => read(key));
  const update = useCallback(
    (change: Partial<InstrumentChoice>) => {
      setChoice((prev) => {
        const next = { ...prev, ...change };
        try {
          window.localStorage.setItem(key, JSON.stringify(next));
        } catch {
          // Not remembered, but still used for this page.
        }
        return next;
      });
    },
    [key],
  );
  return [choice, update];
}
