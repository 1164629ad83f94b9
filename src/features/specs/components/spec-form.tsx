/**
 * The specification editor: the same zod schema as the server (shared/schemas/spec.ts) checks every
 * field in place, including each partial row (`partials.N.field`). Saving an existing spec makes a
 * new immutable version, so it asks for a change note. Targets take Hz or a note name; tolerances
 * take cents, Hz or ppm, and each shows what it means in the other units as it is typed.
 */
import { SERIES_WORDS } from "@shared/strike-note";
import { zodResolver } from "@hookform/resolvers/zod";
import { useState } from "react";
import { useFieldArray, useForm, type FieldError, type UseFormReturn } from "react-hook-form";
import { A4_HZ } from "@shared/physics";
import {
  decisionRuleLabels,
  decisionRuleShortLabels,
  decisionRules,
  familyLabels,
  families,
  nominalTargetHz,
  specInputSchema,
  targetKindLabels,
  targetKinds,
  type Family,
  type SpecFormValues,
  type SpecInput,
} from "@shared/schemas/spec";
import { COMMON_REFERENCE_PITCHES_HZ, describeTolerance, nearestNote, noteNameHz, normaliseNoteName, prettyNoteName, toleranceToCents, toleranceUnitLabels, toleranceUnits, type ToleranceUnit } from "@shared/tuning";
import { Alert } from "@/components/ui/alert";
import { Button } from "@/components/ui/button";
import { CheckboxField, InputField, SelectField, TextAreaField } from "@/components/ui/field";
import { isApiError } from "@/lib/api-client";

type Props = {
  defaultValues: SpecFormValues;
  mode: "create" | "version";
  /** The family can only be chosen when creating; a new version keeps it. */
  familyLocked?: boolean;
  onFamilyChange?: (family: SpecFormValues["family"]) => void;
  onSubmit: (values: SpecInput) => Promise<unknown>;
  submitLabel: string;
};

/** Empty optional number fields are null (the schema's "not set"), not 0 and not NaN. */
const optionalNumber = (value: unknown) => (value === "" || value == null ? null : Number(value));
/** Empty required number fields stay undefined, so the schema says "must be a number". */
const requiredNumber = (value: unknown) => (value === "" || value == null ? undefined : Number(value));

/** Shells are not beams: no vibrating length, no length estimate. */
const SHELL_FAMILIES: readonly Family[] = ["handbell", "bowl"];

type PartialValues = SpecFormValues["partials"][number];

const emptyPartial = (): PartialValues => ({
  label: "",
  isFundamental: false,
  targetKind: "ratio",
  targetHz: null,
  targetNote: null,
  ratio: null,
  toleranceCents: null,
  toleranceUnit: "cents",
  toleranceValue: 25,
  minT60S: null,
  minQ: null,
  maxBeatHz: null,
  required: false,
});

/**
 * The form edits each tolerance as typed (`toleranceValue` in `toleranceUnit`); the cents the
 * evaluation uses are derived on save, so a stale `toleranceCents` never overrides an edit.
 */
export function toFormValues(values: SpecFormValues): SpecFormValues {
  return {
    ...values,
    referencePitchHz: values.referencePitchHz ?? A4_HZ,
    partials: values.partials.map((p) => {
      const unit = p.toleranceUnit ?? "cents";
      return { ...p, targetNote: p.targetNote ?? null, toleranceUnit: unit, toleranceValue: unit === "cents" ? (p.toleranceCents ?? p.toleranceValue ?? null) : (p.toleranceValue ?? null), toleranceCents: null };
    }),
  };
}

export function SpecForm({ defaultValues, mode, familyLocked, onFamilyChange, onSubmit, submitLabel }: Props) {
  const [formError, setFormError] = useState<string | null>(null);
  const form = useForm<SpecFormValues, unknown, SpecInput>({ resolver: zodResolver(specInputSchema), defaultValues: toFormValues(defaultValues), mode: "onTouched" });
  const { errors, isSubmitting } = form.formState;
  const partials = useFieldArray({ control: form.control, name: "partials" });
  const watched = form.watch("partials");
  const family = form.watch("family");
  const referencePitch = Number(form.watch("referencePitchHz")) || A4_HZ;

  const submit = form.handleSubmit(async (values) => {
    setFormError(null);
    if (mode === "version" && !values.changeNote.trim()) {
      form.setError("changeNote", { type: "required", message: "Say what changed and why: the note stays with the new version." });
      return;
    }
    try {
      await onSubmit(values);
    } catch (error) {
      if (!isApiError(error)) {
        setFormError("Something went wrong. Try again.");
        return;
      }
      let placed = false;
      for (const [field, message] of Object.entries(error.fields ?? {})) {
        if (field === "_") continue;
        form.setError(field.replace(/\.toleranceCents$/, ".toleranceValue") as never, { type: "server", message });
        placed = true;
      }
      if (!placed || error.status !== 400) setFormError(error.message);
    }
  });

  const arrayError = (errors.partials as { message?: string; root?: FieldError } | undefined)?.message ?? errors.partials?.root?.message;
  // The fundamental's target, Hz, for showing a ratio partial's tolerance in Hz.
  const fundamental = watched?.find((p) => p.isFundamental);
  const fundamentalHz = fundamental ? targetHzOf(fundamental, referencePitch) : null;

  return (
    <form onSubmit={submit} noValidate className="flex flex-col gap-6" aria-label="Specification">
      {formError ? <Alert tone="error">{formError}</Alert> : null}

      <div className="grid gap-4 sm:grid-cols-2">
        <InputField label="Name" error={errors.name?.message} {...form.register("name")} />
        {familyLocked ? (
          // A new version keeps its family; the value stays in the form from defaultValues.
          <InputField label="Product family" readOnly value={familyLabels[defaultValues.family]} hint="A new version keeps the product family." />
        ) : (
          <SelectField label="Product family" error={errors.family?.message} {...form.register("family", { onChange: (event) => onFamilyChange?.(event.target.value) })}>
            {families.map((f) => (
              <option key={f} value={f}>
                {familyLabels[f]}
              </option>
            ))}
          </SelectField>
        )}
      </div>

      <TextAreaField label="Description and sources" rows={5} error={errors.description?.message} {...form.register("description")} />

      <div className="grid gap-4 sm:grid-cols-2 lg:grid-cols-3">
        <InputField
          label="Reference pitch A4 (Hz)"
          type="number"
          step="any"
          inputMode="decimal"
          list="reference-pitches"
          hint="Notes are tuned to it. 440 Hz is the standard (ISO 16); orchestras also order 442, 443 or 432 Hz."
          error={errors.referencePitchHz?.message}
          {...form.register("referencePitchHz", { setValueAs: requiredNumber })}
        />
        <datalist id="reference-pitches">
          {COMMON_REFERENCE_PITCHES_HZ.map((hz) => (
            <option key={hz} value={hz} />
          ))}
        </datalist>
        <InputField
          label="Reference temperature (°C)"
          type="number"
          step="any"
          inputMode="decimal"
          hint="Measured frequencies are corrected to this temperature."
          error={errors.referenceTemperatureC?.message}
          {...form.register("referenceTemperatureC", { setValueAs: requiredNumber })}
        />
        <InputField
          label="Temperature coefficient (per °C)"
          type="number"
          step="any"
          inputMode="decimal"
          hint="Relative change of frequency per °C; about −0.0001 for steel, a typical starting value — confirm with your own parts."
          error={errors.tempCoefficientPerC?.message}
          {...form.register("tempCoefficientPerC", { setValueAs: requiredNumber })}
        />
        <InputField
          label="Strikes required per unit"
          type="number"
          step="1"
          inputMode="numeric"
          error={errors.strikesRequired?.message}
          {...form.register("strikesRequired", { setValueAs: requiredNumber })}
        />
        <div className="sm:col-span-2">
          <SelectField label="Decision rule" hint={decisionRuleLabels[form.watch("decisionRule") ?? "simple"]} error={errors.decisionRule?.message} {...form.register("decisionRule")}>
            {decisionRules.map((rule) => (
              <option key={rule} value={rule}>
                {decisionRuleShortLabels[rule]}
              </option>
            ))}
          </SelectField>
        </div>
        {SHELL_FAMILIES.includes(family) ? null : (
          <InputField
            label="Vibrating length (mm, optional)"
            type="number"
            step="any"
            inputMode="decimal"
            hint="Lets the tuning guidance estimate how much to shorten."
            error={errors.lengthMm?.message}
            {...form.register("lengthMm", { setValueAs: optionalNumber })}
          />
        )}
      </div>

      <fieldset className="flex flex-col gap-4">
        <legend className="mb-2 text-title font-semibold">Partials</legend>
        <p className="-mt-2 text-caption text-ink-soft">
          One row per partial the unit must (or may) show. Mark one as the fundamental, f₁, with a target in Hz, a note, or — for a tube — its strike note; give the others as a ratio to it or in Hz.
        </p>
        {arrayError ? (
          <p role="alert" className="text-caption font-medium text-rust-700">
            {arrayError}
          </p>
        ) : null}
        {partials.fields.map((field, index) => {
          const rowErrors = errors.partials?.[index];
          const row = watched?.[index];
          const kind = row?.targetKind ?? field.targetKind;
          const label = row?.label || `Partial ${index + 1}`;
          const unit = (row?.toleranceUnit ?? "cents") as ToleranceUnit;
          const atHz = row ? nominalTargetHz({ targetKind: row.targetKind, targetHz: targetHzOf(row, referencePitch), ratio: row.ratio ?? null }, fundamentalHz) : null;
          return (
            <fieldset key={field.id} className="min-w-0 rounded-control border border-line bg-canvas p-4" aria-label={`Partial ${index + 1}`}>
              <div className="mb-3 flex flex-wrap items-center justify-between gap-2">
                <legend className="font-semibold">{label}</legend>
                <Button variant="quiet" size="sm" onClick={() => partials.remove(index)} disabled={partials.fields.length <= 1} aria-label={`Remove ${label}`}>
                  Remove
                </Button>
              </div>
              <div className="grid gap-3 sm:grid-cols-2 lg:grid-cols-4">
                <InputField label="Label" error={rowErrors?.label?.message} {...form.register(`partials.${index}.label`)} />
                <SelectField label="Target kind" error={rowErrors?.targetKind?.message} {...form.register(`partials.${index}.targetKind`)}>
                  {targetKinds.map((k) => (
                    <option key={k} value={k}>
                      {targetKindLabels[k]}
                    </option>
                  ))}
                </SelectField>
                {kind === "ratio" ? (
                  <InputField
                    label="Ratio (× fundamental)"
                    type="number"
                    step="any"
                    inputMode="decimal"
                    error={rowErrors?.ratio?.message}
                    {...form.register(`partials.${index}.ratio`, { setValueAs: optionalNumber })}
                  />
                ) : (
                  <TargetInput form={form} index={index} referencePitchHz={referencePitch} strikeNote={kind === "strike_note"} error={rowErrors?.targetNote?.message ?? rowErrors?.targetHz?.message} />
                )}
                <div className="grid grid-cols-[minmax(0,1fr)_8.5rem] items-start gap-2 sm:col-span-2">
                  <InputField
                    label={`Tolerance (± ${toleranceUnitLabels[unit]})`}
                    type="number"
                    step="any"
                    inputMode="decimal"
                    hint={<ToleranceHint value={row?.toleranceValue} unit={unit} atHz={atHz} />}
                    error={rowErrors?.toleranceValue?.message ?? rowErrors?.toleranceCents?.message ?? rowErrors?.toleranceUnit?.message}
                    {...form.register(`partials.${index}.toleranceValue`, { setValueAs: optionalNumber })}
                  />
                  <SelectField label="Unit" {...form.register(`partials.${index}.toleranceUnit`)}>
                    {toleranceUnits.map((u) => (
                      <option key={u} value={u}>
                        {toleranceUnitLabels[u]}
                      </option>
                    ))}
                  </SelectField>
                </div>
                <InputField
                  label="Minimum T60 (s)"
                  type="number"
                  step="any"
                  inputMode="decimal"
                  error={rowErrors?.minT60S?.message}
                  {...form.register(`partials.${index}.minT60S`, { setValueAs: optionalNumber })}
                />
                <InputField
                  label="Minimum Q"
                  type="number"
                  step="any"
                  inputMode="decimal"
                  error={rowErrors?.minQ?.message}
                  {...form.register(`partials.${index}.minQ`, { setValueAs: optionalNumber })}
                />
                <InputField
                  label="Maximum beat (Hz)"
                  type="number"
                  step="any"
                  inputMode="decimal"
                  error={rowErrors?.maxBeatHz?.message}
                  {...form.register(`partials.${index}.maxBeatHz`, { setValueAs: optionalNumber })}
                />
                <div className="flex flex-col justify-end gap-2 pb-1">
                  <CheckboxField label="Fundamental (f₁)" error={rowErrors?.isFundamental?.message} {...form.register(`partials.${index}.isFundamental`)} />
                  <CheckboxField label="Required for a verdict" error={rowErrors?.required?.message} {...form.register(`partials.${index}.required`)} />
                </div>
              </div>
              {kind === "strike_note" ? (
                <p className="mt-3 max-w-prose text-caption text-ink-soft">
                  The strike note is the pitch heard from a tube: the common fundamental of the partials that stand near {SERIES_WORDS}, about an octave below the lowest of them — the usual
                  reading for tubular chimes. Each strike page shows which partials it was read from.
                </p>
              ) : null}
            </fieldset>
          );
        })}
        <div>
          <Button variant="secondary" onClick={() => partials.append(emptyPartial())} disabled={partials.fields.length >= 16}>
            Add a partial
          </Button>
        </div>
      </fieldset>

      {mode === "version" ? (
        <TextAreaField
          label="Change note"
          rows={3}
          hint="What changed and why. Batches already made keep the version they were made under."
          error={errors.changeNote?.message}
          {...form.register("changeNote")}
        />
      ) : null}

      <div className="flex flex-wrap gap-2">
        <Button type="submit" pending={isSubmitting}>
          {submitLabel}
        </Button>
      </div>
    </form>
  );
}

function targetHzOf(p: Pick<PartialValues, "targetHz" | "targetNote">, referencePitchHz: number): number | null {
  if (p.targetNote) {
    const normal = normaliseNoteName(p.targetNote);
    if (normal) return noteNameHz(normal, referencePitchHz);
  }
  return p.targetHz ?? null;
}

/**
 * One box for a target in Hz or as a note name: "523.25" sets targetHz, "C5" sets targetNote (and
 * the Hz it means at the reference pitch). The hint says what was understood.
 */
function TargetInput({ form, index, referencePitchHz, strikeNote, error }: { form: UseFormReturn<SpecFormValues, unknown, SpecInput>; index: number; referencePitchHz: number; strikeNote: boolean; error?: string }) {
  const note = form.watch(`partials.${index}.targetNote`);
  const hz = form.watch(`partials.${index}.targetHz`);
  const [text, setText] = useState(() => (note ? prettyNoteName(note) : hz != null ? String(hz) : ""));
  const set = (raw: string) => {
    setText(raw);
    const trimmed = raw.trim().replace(/\s*hz$/i, "");
    const options = { shouldDirty: true, shouldValidate: form.formState.isSubmitted };
    if (trimmed === "") {
      form.setValue(`partials.${index}.targetNote`, null, options);
      form.setValue(`partials.${index}.targetHz`, null, options);
    } else if (/^[0-9]*[.,]?[0-9]+$/.test(trimmed)) {
      form.setValue(`partials.${index}.targetNote`, null, options);
      form.setValue(`partials.${index}.targetHz`, Number(trimmed.replace(",", ".")), options);
    } else {
      // A note name (or something the schema will say is not one).
      form.setValue(`partials.${index}.targetNote`, trimmed, options);
      form.setValue(`partials.${index}.targetHz`, null, options);
    }
  };
  const normal = note ? normaliseNoteName(note) : null;
  let hint: string;
  if (normal) hint = `${prettyNoteName(normal)} = ${noteNameHz(normal, referencePitchHz).toFixed(3)} Hz at A4 = ${referencePitchHz} Hz`;
  else if (hz != null && hz > 0) {
    const n = nearestNote(hz, referencePitchHz);
    hint = `${hz} Hz is ${n.name} ${n.cents >= 0 ? "+" : "−"}${Math.abs(n.cents).toFixed(1)} cents at A4 = ${referencePitchHz} Hz`;
  } else hint = "A frequency, or a note name such as C5, F#4 or Bb3.";
  return (
    <InputField
      label={strikeNote ? "Strike note target (Hz)" : "Target (Hz)"}
      inputMode="text"
      autoComplete="off"
      spellCheck={false}
      value={text}
      onChange={(event) => set(event.target.value)}
      onBlur={() => form.trigger(`partials.${index}.targetNote`)}
      hint={hint}
      error={error}
    />
  );
}

/** "= ±1.27 Hz, ±2892 ppm" under the tolerance box, in the two units not typed. */
function ToleranceHint({ value, unit, atHz }: { value: unknown; unit: ToleranceUnit; atHz: number | null }) {
  const v = typeof value === "number" ? value : Number(value);
  if (!Number.isFinite(v) || v <= 0) return <>Cents, Hz or ppm; each is shown in the others.</>;
  if (unit === "hz" && atHz === null) return <>A tolerance in Hz needs a target frequency.</>;
  const description = describeTolerance(toleranceToCents(v, unit, atHz), atHz, unit, v);
  const others = description.slice(description.indexOf("(") + 1, -1);
  return <>= {others}{atHz !== null ? ` at ${atHz.toFixed(atHz < 1000 ? 2 : 1)} Hz` : ""}</>;
}
