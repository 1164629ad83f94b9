/** A new recorder or thermometer: name, model, serial and how long a calibration stays valid. */
import { zodResolver } from "@hookform/resolvers/zod";
import { useState } from "react";
import { useForm } from "react-hook-form";
import type { z } from "zod";
import { createInstrumentSchema } from "@shared/schemas/instrument";
import { Alert } from "@/components/ui/alert";
import { Button } from "@/components/ui/button";
import { InputField, SelectField } from "@/components/ui/field";
import { applyServerErrors } from "@/lib/form-errors";
import { useCreateInstrument } from "../api/create-instrument";

type FormValues = z.input<typeof createInstrumentSchema>;
type FormOutput = z.output<typeof createInstrumentSchema>;

export function CreateInstrumentForm({ workshopId, onCreated }: { workshopId: string; onCreated: (id: string) => void }) {
  const create = useCreateInstrument(workshopId);
  const [formError, setFormError] = useState<string | null>(null);
  const form = useForm<FormValues, unknown, FormOutput>({
    resolver: zodResolver(createInstrumentSchema),
    defaultValues: { kind: "recorder", name: "", model: "", serial: "", validityMonths: 12 },
    mode: "onTouched",
  });
  const { errors, isSubmitting } = form.formState;
  const onSubmit = form.handleSubmit(async (values) => {
    setFormError(null);
    try {
      const { id } = await create.mutateAsync(values);
      onCreated(id);
    } catch (error) {
      setFormError(applyServerErrors(error, form.setError, ["kind", "name", "model", "serial", "validityMonths"]));
    }
  });
  return (
    <form onSubmit={onSubmit} noValidate aria-label="New instrument" className="flex flex-col gap-4">
      {formError ? <Alert tone="error">{formError}</Alert> : null}
      <div className="grid gap-4 sm:grid-cols-2 lg:grid-cols-5">
        <SelectField label="Kind" error={errors.kind?.message} {...form.register("kind")}>
          <option value="recorder">Recorder (sound card, recorder, tablet)</option>
          <option value="thermometer">Thermometer</option>
        </SelectField>
        <InputField label="Name" placeholder="e.g. Bench recorder B" error={errors.name?.message} {...form.register("name")} />
        <InputField label="Model (optional)" error={errors.model?.message} {...form.register("model")} />
        <InputField label="Serial (optional)" error={errors.serial?.message} {...form.register("serial")} />
        <InputField label="Calibration valid for (months)" type="number" inputMode="numeric" min={1} max={60} step={1} error={errors.validityMonths?.message} hint="Typically 12 — follow your quality system." {...form.register("validityMonths")} />
      </div>
      <div>
        <Button type="submit" pending={isSubmitting}>
          Add instrument
        </Button>
      </div>
    </form>
  );
}
