/**
 * The specification editor: the same zod schema as the server (shared/schemas/spec.ts) checks every
 * field in place, including each partial row (`partials.N.field`). Saving an existing spec makes a
 * new immutable version, so it asks for a change note.
 */
import { zodResolver } from "@hookform/resolvers/zod";
import { useState } from "react";
import { useFieldArray, useForm, type FieldError } from "react-hook-form";
import { decisionRuleLabels, decisionRules, familyLabels, families, specInputSchema, type SpecFormValues, type SpecInput } from "@shared/schemas/spec";
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

const emptyPartial = (): SpecFormValues["partials"][number] => ({
  label: "",
  isFundamental: false,
  targetKind: "ratio",
  targetHz: null,
  ratio: null,
  toleranceCents: 25,
  minT60S: null,
  minQ: null,
  maxBeatHz: null,
  required: false,
});

export function SpecForm({ defaultValues, mode, familyLocked, onFamilyChange, onSubmit, submitLabel }: Props) {
  const [formError, setFormError] = useState<string | null>(null);
  const form = useForm<SpecFormValues, unknown, SpecInput>({ resolver: zodResolver(specInputSchema), defaultValues, mode: "onTouched" });
  const { errors, isSubmitting } = form.formState;
  const partials = useFieldArray({ control: form.control, name: "partials" });
  const watched = form.watch("partials");

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
        form.setError(field as never, { type: "server", message });
        placed = true;
      }
      if (!placed || error.status !== 400) setFormError(error.message);
    }
  });

  const arrayError = (errors.partials as { message?: string; root?: FieldError } | undefined)?.message ?? errors.partials?.root?.message;

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
            {families.map((family) => (
              <option key={family} value={family}>
                {familyLabels[family]}
              </option>
            ))}
          </SelectField>
        )}
      </div>

      <TextAreaField label="Description and sources" rows={5} error={errors.description?.message} {...form.register("description")} />

      <div className="grid gap-4 sm:grid-cols-2 lg:grid-cols-3">
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
          hint="Relative change of frequency per °C; about −0.0001 for steel (from memory — confirm for your alloy)."
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
          <SelectField label="Decision rule" error={errors.decisionRule?.message} {...form.register("decisionRule")}>
            {decisionRules.map((rule) => (
              <option key={rule} value={rule}>
                {decisionRuleLabels[rule]}
              </option>
            ))}
          </SelectField>
        </div>
        <InputField
          label="Vibrating length (mm, optional)"
          type="number"
          step="any"
          inputMode="decimal"
          hint="Lets the tuning guidance estimate how much to shorten."
          error={errors.lengthMm?.message}
          {...form.register("lengthMm", { setValueAs: optionalNumber })}
        />
      </div>

      <fieldset className="flex flex-col gap-4">
        <legend className="mb-2 text-title font-semibold">Partials</legend>
        <p className="-mt-2 text-caption text-ink-soft">
          One row per partial the unit must (or may) show. Mark one as the fundamental with a target in Hz; give the others as a ratio to it or in Hz.
        </p>
        {arrayError ? (
          <p role="alert" className="text-caption font-medium text-rust-700">
            {arrayError}
          </p>
        ) : null}
        {partials.fields.map((field, index) => {
          const rowErrors = errors.partials?.[index];
          const kind = watched?.[index]?.targetKind ?? field.targetKind;
          const label = watched?.[index]?.label || `Partial ${index + 1}`;
          return (
            <fieldset key={field.id} className="rounded-control border border-line bg-canvas p-4" aria-label={`Partial ${index + 1}`}>
              <div className="mb-3 flex flex-wrap items-center justify-between gap-2">
                <legend className="font-semibold">{label}</legend>
                <Button variant="quiet" size="sm" onClick={() => partials.remove(index)} disabled={partials.fields.length <= 1} aria-label={`Remove ${label}`}>
                  Remove
                </Button>
              </div>
              <div className="grid gap-3 sm:grid-cols-2 lg:grid-cols-4">
                <InputField label="Label" error={rowErrors?.label?.message} {...form.register(`partials.${index}.label`)} />
                <SelectField label="Target kind" error={rowErrors?.targetKind?.message} {...form.register(`partials.${index}.targetKind`)}>
                  <option value="absolute">Absolute (Hz)</option>
                  <option value="ratio">Ratio to f₁</option>
                </SelectField>
                {kind === "absolute" ? (
                  <InputField
                    label="Target (Hz)"
                    type="number"
                    step="any"
                    inputMode="decimal"
                    error={rowErrors?.targetHz?.message}
                    {...form.register(`partials.${index}.targetHz`, { setValueAs: optionalNumber })}
                  />
                ) : (
                  <InputField
                    label="Ratio (× fundamental)"
                    type="number"
                    step="any"
                    inputMode="decimal"
                    error={rowErrors?.ratio?.message}
                    {...form.register(`partials.${index}.ratio`, { setValueAs: optionalNumber })}
                  />
                )}
                <InputField
                  label="Tolerance (± cents)"
                  type="number"
                  step="any"
                  inputMode="decimal"
                  error={rowErrors?.toleranceCents?.message}
                  {...form.register(`partials.${index}.toleranceCents`, { setValueAs: requiredNumber })}
                />
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
                  <CheckboxField label="Fundamental" error={rowErrors?.isFundamental?.message} {...form.register(`partials.${index}.isFundamental`)} />
                  <CheckboxField label="Required for a verdict" error={rowErrors?.required?.message} {...form.register(`partials.${index}.required`)} />
                </div>
              </div>
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
