/**
 * New batch: code, specification, quantity and an optional serial range. The range's expansion is
 * counted in place (shared/serials.ts, the same code the server runs), so a slip shows before sending.
 */
import { zodResolver } from "@hookform/resolvers/zod";
import { useState } from "react";
import { useForm } from "react-hook-form";
import { z } from "zod";
import { createBatchSchema, type BatchDetail } from "@shared/schemas/batch";
import { familyLabels, type Family } from "@shared/schemas/spec";
import { expandSerialRange, offsetSerial, SerialRangeError } from "@shared/serials";
import { Alert } from "@/components/ui/alert";
import { Button } from "@/components/ui/button";
import { InputField, SelectField, TextAreaField } from "@/components/ui/field";
import { useMediaQuery } from "@/lib/use-media-query";
import { applyServerErrors } from "@/lib/form-errors";
import { useCreateBatch } from "../api/create-batch";

export type SpecChoice = { id: string; name: string; currentVersion: number; family?: Family };

/** The form keeps the range as two optional text fields; the request wants `range` only when both are given. */
const formSchema = createBatchSchema.omit({ range: true }).extend({ rangeFrom: z.string().trim(), rangeTo: z.string().trim() });
type FormValues = z.input<typeof formSchema>;
type FormOutput = z.output<typeof formSchema>;

export function rangePreview(from: string, to: string): { count: number; first: string; last: string } | { error: string } | null {
  if (!from.trim() && !to.trim()) return null;
  try {
    const serials = expandSerialRange(from, to);
    return { count: serials.length, first: serials[0], last: serials[serials.length - 1] };
  } catch (error) {
    return { error: error instanceof SerialRangeError ? error.message : "This range cannot be read." };
  }
}

export function CreateBatchForm({ workshopId, specs, defaultSpecId, onCreated }: { workshopId: string; specs: SpecChoice[]; defaultSpecId?: string; onCreated: (batch: BatchDetail) => void }) {
  const create = useCreateBatch(workshopId);
  const [formError, setFormError] = useState<string | null>(null);
  const form = useForm<FormValues, unknown, FormOutput>({
    resolver: zodResolver(formSchema),
    defaultValues: { code: "", specId: defaultSpecId ?? specs[0]?.id ?? "", quantity: 10, rangeFrom: "", rangeTo: "", notes: "" },
    mode: "onTouched",
  });
  const { errors, isSubmitting } = form.formState;
  const [from, to, quantity] = form.watch(["rangeFrom", "rangeTo", "quantity"]);
  const preview = rangePreview(from ?? "", to ?? "");
  // The example range follows the quantity: 10 units from F-0001 end at F-0010.
  const firstPlaceholder = "F-0001";
  const lastPlaceholder = offsetSerial(from?.trim() || firstPlaceholder, Math.max(1, typeof quantity === "number" && Number.isFinite(quantity) ? Math.round(quantity) : 1) - 1) ?? "";
  // A closed select cuts a long name short on a phone: there the choices are a list of radio buttons.
  const phone = useMediaQuery("(max-width: 39.99rem)");

  const onSubmit = form.handleSubmit(async ({ rangeFrom, rangeTo, ...values }) => {
    setFormError(null);
    if (preview && "error" in preview) {
      form.setError("rangeTo", { type: "range", message: preview.error });
      return;
    }
    if (preview && preview.count > values.quantity) {
      form.setError("quantity", { type: "range", message: `The range holds ${preview.count} serials, more than the quantity; set the quantity to at least ${preview.count} or shorten the range.` });
      return;
    }
    try {
      const batch = await create.mutateAsync({ ...values, range: rangeFrom && rangeTo ? { from: rangeFrom, to: rangeTo } : undefined });
      onCreated(batch);
    } catch (error) {
      setFormError(applyServerErrors(error, form.setError, ["code", "specId", "quantity", "notes"]));
    }
  });

  return (
    <form onSubmit={onSubmit} noValidate className="flex flex-col gap-4" aria-label="New batch">
      {formError ? <Alert tone="error">{formError}</Alert> : null}
      <div className="grid gap-4 sm:grid-cols-2">
        <InputField label="Batch code" placeholder="e.g. BTW-2613" error={errors.code?.message} {...form.register("code")} />
        {phone ? (
          <fieldset className="flex flex-col gap-2 sm:col-span-2">
            <legend className="mb-1.5 text-caption font-semibold">Specification</legend>
            {specs.map((spec) => (
              <label key={spec.id} className="flex cursor-pointer items-start gap-3 rounded-control border border-line-strong bg-surface px-3 py-2 has-[:checked]:border-steel-600 has-[:checked]:bg-steel-50">
                <input type="radio" value={spec.id} className="mt-1 size-5 shrink-0 accent-steel-600" {...form.register("specId")} />
                <span className="min-w-0 break-words">
                  {spec.name}
                  <span className="block text-caption text-ink-soft">
                    version {spec.currentVersion}
                    {spec.family ? ` · ${familyLabels[spec.family]}` : ""}
                  </span>
                </span>
              </label>
            ))}
            {errors.specId?.message ? <p className="text-caption font-medium text-rust-700">{errors.specId.message}</p> : null}
          </fieldset>
        ) : (
          <div className="sm:col-span-2">
            <SelectField label="Specification" error={errors.specId?.message} {...form.register("specId")}>
              {specs.map((spec) => (
                <option key={spec.id} value={spec.id}>
                  {spec.name} (version {spec.currentVersion})
                </option>
              ))}
            </SelectField>
          </div>
        )}
        <InputField
          label="Quantity (units)"
          type="number"
          inputMode="numeric"
          step="1"
          error={errors.quantity?.message}
          {...form.register("quantity", { setValueAs: (v) => (v === "" ? undefined : Number(v)) })}
        />
      </div>
      <fieldset className="grid gap-4 sm:grid-cols-2">
        <legend className="mb-1 text-caption font-semibold">Serial range (optional)</legend>
        <InputField label="First serial" placeholder={firstPlaceholder} error={errors.rangeFrom?.message} {...form.register("rangeFrom")} />
        <InputField label="Last serial" placeholder={lastPlaceholder} error={errors.rangeTo?.message} {...form.register("rangeTo")} />
        <p className="text-caption sm:col-span-2" role="status" aria-live="polite">
          {preview === null ? (
            <span className="text-ink-faint">Leave empty to add the units later, by list or range, on the batch page.</span>
          ) : "error" in preview ? (
            <span className="font-medium text-rust-700">{preview.error}</span>
          ) : (
            <span className={preview.count === quantity ? "text-moss-600" : "text-ochre-600"}>
              {preview.first} … {preview.last}: {preview.count} serial{preview.count === 1 ? "" : "s"}
              {preview.count === quantity
                ? ", matching the quantity."
                : typeof quantity === "number" && preview.count < quantity
                  ? `; the other ${quantity - preview.count} can be added later.`
                  : `, more than the quantity (${quantity ?? "not set"}).`}
            </span>
          )}
        </p>
      </fieldset>
      <TextAreaField label="Notes (optional)" rows={2} error={errors.notes?.message} {...form.register("notes")} />
      <div>
        <Button type="submit" pending={isSubmitting} disabled={specs.length === 0}>
          Create batch
        </Button>
      </div>
    </form>
  );
}
