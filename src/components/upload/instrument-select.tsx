/**
 * Which recorder the strike is recorded with and which thermometer the temperature was read on,
 * as the unit and batch uploads ask for them. The choice is remembered per person and browser.
 */
import { calibrationStatusLabels, type CalibrationStatus, type InstrumentKind } from "@shared/schemas/instrument";
import { SelectField } from "@/components/ui/field";
import type { InstrumentChoice } from "@/lib/instrument-choice";

export type InstrumentOption = { id: string; kind: InstrumentKind; name: string; status: CalibrationStatus };

const note = (status: CalibrationStatus) => (status === "calibrated" ? "" : ` (${calibrationStatusLabels[status].toLowerCase()})`);

function hintFor(option: InstrumentOption | undefined, what: string): string {
  if (!option) return `No ${what} named: the assumed tolerance applies.`;
  if (option.status === "expired" || option.status === "never") return "Not in calibration: accepted, with the assumed tolerance instead of a correction.";
  if (option.status === "due_soon") return "Calibrated, due again soon: its offset is corrected.";
  return "Calibrated: its offset is corrected.";
}

export function InstrumentSelects({ instruments, value, onChange, disabled, temperatureGiven }: { instruments: InstrumentOption[]; value: InstrumentChoice; onChange: (change: Partial<InstrumentChoice>) => void; disabled?: boolean; temperatureGiven: boolean }) {
  const recorders = instruments.filter((i) => i.kind === "recorder");
  const thermometers = instruments.filter((i) => i.kind === "thermometer");
  // A remembered instrument that no longer exists in this workshop is not offered.
  const recorderId = recorders.some((r) => r.id === value.recorderId) ? value.recorderId : "";
  const thermometerId = thermometers.some((t) => t.id === value.thermometerId) ? value.thermometerId : "";
  return (
    <>
      <SelectField label="Recorded with" value={recorderId} disabled={disabled} hint={hintFor(recorders.find((r) => r.id === recorderId), "recorder")} onChange={(e) => onChange({ recorderId: e.target.value })}>
        <option value="">Not named</option>
        {recorders.map((r) => (
          <option key={r.id} value={r.id}>
            {r.name}
            {note(r.status)}
          </option>
        ))}
      </SelectField>
      <SelectField
        label="Thermometer"
        value={thermometerId}
        disabled={disabled || !temperatureGiven}
        hint={temperatureGiven ? hintFor(thermometers.find((t) => t.id === thermometerId), "thermometer") : "Used when a temperature is entered."}
        onChange={(e) => onChange({ thermometerId: e.target.value })}
      >
        <option value="">Not named</option>
        {thermometers.map((t) => (
          <option key={t.id} value={t.id}>
            {t.name}
            {note(t.status)}
          </option>
        ))}
      </SelectField>
    </>
  );
}

/** The ids to send with an upload: a remembered instrument that is not in the list is left out; the thermometer only with a temperature. */
export function instrumentsToSend(instruments: InstrumentOption[], value: InstrumentChoice, temperatureC: number | null): { recorderId: string | null; thermometerId: string | null } {
  const has = (id: string, kind: InstrumentKind) => instruments.some((i) => i.id === id && i.kind === kind);
  return {
    recorderId: value.recorderId && has(value.recorderId, "recorder") ? value.recorderId : null,
    thermometerId: temperatureC !== null && value.thermometerId && has(value.thermometerId, "thermometer") ? value.thermometerId : null,
  };
}
