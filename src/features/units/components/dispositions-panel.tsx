/** QA's decision on a nonconforming unit, with a required reason, and the history of decisions. */
import { zodResolver } from "@hookform/resolvers/zod";
import { useState } from "react";
import { useForm } from "react-hook-form";
import { dispositionDecisions, dispositionInputSchema, dispositionLabels, type DispositionInput } from "@shared/schemas/batch";
import type { UnitDetail } from "@shared/schemas/strike";
import { Alert } from "@/components/ui/alert";
import { Button } from "@/components/ui/button";
import { SelectField, TextAreaField } from "@/components/ui/field";
import { DispositionBadge } from "@/components/ui/status-badges";
import { applyServerErrors } from "@/lib/form-errors";
import { formatDateTime } from "@/lib/format";
import { useCreateDisposition } from "../api/create-disposition";

export function DispositionsPanel({ workshopId, unit, canDecide }: { workshopId: string; unit: UnitDetail; canDecide: boolean }) {
  const needsDecision = unit.evaluation !== null && unit.evaluation.verdict !== "within_tolerance";
  const open = unit.batch.state !== "released";
  return (
    <div className="flex flex-col gap-4">
      {canDecide && needsDecision && open ? (
        <DispositionForm workshopId={workshopId} unitId={unit.id} />
      ) : (
        <p className="text-ink-soft">
          {!needsDecision
            ? unit.evaluation
              ? "The unit is within tolerance: no disposition is needed."
              : "A disposition is decided once the unit has a verdict that is not within tolerance."
            : !open
              ? "The batch is released; its dispositions are final."
              : "A quality member or the owner decides what happens to this unit."}
        </p>
      )}
      {unit.dispositions.length > 0 ? (
        <ol aria-label="Disposition history" className="divide-y divide-line rounded-control border border-line">
          {unit.dispositions.map((d) => (
            <li key={d.id} className="px-4 py-3">
              <div className="flex flex-wrap items-center gap-2">
                <DispositionBadge decision={d.decision} />
                <span className="text-caption text-ink-soft">
                  {d.by?.name ?? "Unknown"} · {formatDateTime(d.at)}
                  {unit.evaluation && d.evaluationId && d.evaluationId !== unit.evaluation.id ? " · on an earlier evaluation" : ""}
                </span>
              </div>
              <p className="mt-1">{d.reason}</p>
            </li>
          ))}
        </ol>
      ) : null}
    </div>
  );
}

function DispositionForm({ workshopId, unitId }: { workshopId: string; unitId: string }) {
  const create = useCreateDisposition(workshopId, unitId);
  const [formError, setFormError] = useState<string | null>(null);
  const form = useForm<DispositionInput>({ resolver: zodResolver(dispositionInputSchema), defaultValues: { decision: "rework", reason: "" } });
  const { errors, isSubmitting } = form.formState;
  const onSubmit = form.handleSubmit(async (values) => {
    setFormError(null);
    try {
      await create.mutateAsync(values);
      form.reset({ decision: values.decision, reason: "" });
    } catch (error) {
      setFormError(applyServerErrors(error, form.setError, ["decision", "reason"]));
    }
  });
  return (
    <form onSubmit={onSubmit} noValidate aria-label="Disposition" className="flex flex-col gap-3">
      {formError ? <Alert tone="error">{formError}</Alert> : null}
      <SelectField label="Decision" error={errors.decision?.message} {...form.register("decision")}>
        {dispositionDecisions.map((d) => (
          <option key={d} value={d}>
            {dispositionLabels[d]}
          </option>
        ))}
      </SelectField>
      <TextAreaField label="Reason" rows={2} hint="Recorded with your name in the ledger; it cannot be changed later." error={errors.reason?.message} {...form.register("reason")} />
      <div>
        <Button type="submit" pending={isSubmitting}>
          Record disposition
        </Button>
      </div>
    </form>
  );
}
