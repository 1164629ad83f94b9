/** The unit's customer (optional): the certificate form takes its recipient from here. */
import { zodResolver } from "@hookform/resolvers/zod";
import { useState } from "react";
import { useForm } from "react-hook-form";
import { z } from "zod";
import type { UnitDetail } from "@shared/schemas/strike";
import { Alert } from "@/components/ui/alert";
import { Button } from "@/components/ui/button";
import { InputField } from "@/components/ui/field";
import { applyServerErrors } from "@/lib/form-errors";
import { useUpdateUnit } from "../api/update-unit";

const schema = z.object({
  customerName: z.string().trim().max(200, "At most 200 characters"),
  customerEmail: z.union([z.literal(""), z.email("Enter a valid e-mail address, like name@example.com")]),
});
type Values = z.infer<typeof schema>;

export function UnitCustomerForm({ workshopId, unit, canEdit }: { workshopId: string; unit: UnitDetail; canEdit: boolean }) {
  const update = useUpdateUnit(workshopId, unit.id);
  const [formError, setFormError] = useState<string | null>(null);
  const [saved, setSaved] = useState(false);
  const form = useForm<Values>({ resolver: zodResolver(schema), defaultValues: { customerName: unit.customerName ?? "", customerEmail: unit.customerEmail ?? "" } });
  const { errors, isSubmitting, isDirty } = form.formState;

  const onSubmit = form.handleSubmit(async (values) => {
    setFormError(null);
    setSaved(false);
    try {
      await update.mutateAsync({ customerName: values.customerName || null, customerEmail: values.customerEmail || null });
      form.reset(values);
      setSaved(true);
    } catch (error) {
      setFormError(applyServerErrors(error, form.setError, ["customerName", "customerEmail"]));
    }
  });

  return (
    <form onSubmit={onSubmit} noValidate aria-label="Customer" className="flex flex-col gap-3">
      {formError ? <Alert tone="error">{formError}</Alert> : null}
      <div className="grid gap-3 sm:grid-cols-[1fr_1fr_auto] sm:items-end">
        <InputField label="Customer name" readOnly={!canEdit} error={errors.customerName?.message} {...form.register("customerName")} />
        <InputField label="Customer e-mail" type="email" readOnly={!canEdit} error={errors.customerEmail?.message} {...form.register("customerEmail")} />
        {canEdit ? (
          <Button type="submit" variant="secondary" pending={isSubmitting} disabled={!isDirty}>
            Save customer
          </Button>
        ) : null}
      </div>
      {saved && !isDirty ? <p role="status" className="text-caption text-moss-600">Customer saved.</p> : null}
    </form>
  );
}
