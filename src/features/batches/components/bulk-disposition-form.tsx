/** One disposition, with its reason, for the units selected in the ledger (one step, all or nothing). */
import { zodResolver } from "@hookform/resolvers/zod";
import { useState } from "react";
import { useForm } from "react-hook-form";
import { dispositionDecisions, dispositionInputSchema, dispositionLabels, type DispositionInput } from "@shared/schemas/batch";
import { Alert } from "@/components/ui/alert";
import { Button } from "@/components/ui/button";
import { SelectField, TextAreaField } from "@/components/ui/field";
import { applyServerErrors } from "@/lib/form-errors";
import { useRecordBulkDisposition } from "../api/record-bulk-disposition";

type Props = { workshopId: string; batchId: string; selected: { id: string; serial: string }[]; onDone: () => void; onClear: () => void };

export function BulkDispositionForm({ workshopId, batchId, selected, onDone, onClear }: Props) {
  const mutation = useRecordBulkDisposition(workshopId, batchId);
  const [formError, setFormError] = useState<string | null>(null);
  const form = useForm<DispositionInput>({ resolver: zodResolver(dispositionInputSchema), defaultValues: { decision: "rework", reason: "" } });
  const { errors, isSubmitting } = form.formState;
  const n = selected.length;
  const onSubmit = form.handleSubmit(async (values) => {
    setFormError(null);
    try {
      await mutation.mutateAsync({ ...values, unitIds: selected.map((s) => s.id) });
      form.reset({ decision: values.decision, reason: "" });
      onDone();
    } catch (error) {
      setFormError(applyServerErrors(error, form.setError, ["decision", "reason"]));
    }
  });
  return (
    <form onSubmit={onSubmit} noValidate aria-label="Disposition for the selected units" className="no-print flex flex-col gap-3 rounded-control border border-steel-200 bg-steel-50 p-4">
      <p className="font-semibold">
        {n} unit{n === 1 ? "" : "s"} selected: {selected.slice(0, 8).map((s) => s.serial).join(", ")}
        {n > 8 ? ` and ${n - 8} more` : ""}
      </p>
      {formError ? <Alert tone="error">{formError}</Alert> : null}
      <div className="grid gap-3 sm:grid-cols-[16rem_1fr]">
        <SelectField label="Decision for all of them" error={errors.decision?.message} {...form.register("decision")}>
          {dispositionDecisions.map((d) => (
            <option key={d} value={d}>
              {dispositionLabels[d]}
            </option>
          ))}
        </SelectField>
        <TextAreaField label="Reason" rows={2} hint="Recorded for each unit, with your name; it cannot be changed later." error={errors.reason?.message} {...form.register("reason")} />
      </div>
      <div className="flex flex-wrap gap-2">
        <Button type="submit" pending={isSubmitting}>
          Record for {n} unit{n === 1 ? "" : "s"}
        </Button>
        <Button variant="quiet" onClick={onClear}>
          Clear the selection
        </Button>
      </div>
    </form>
  );
}
