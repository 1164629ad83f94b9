/**
 * QA's decision on a nonconforming unit, with a required reason, and the history of decisions.
 * Once a decision stands, a change is a superseding decision with its own reason: both stay listed.
 */
import { zodResolver } from "@hookform/resolvers/zod";
import { useState } from "react";
import { useForm } from "react-hook-form";
import { dispositionDecisions, dispositionInputSchema, dispositionLabels, type DispositionInput } from "@shared/schemas/batch";
import type { UnitDetail } from "@shared/schemas/strike";
import { Alert } from "@/components/ui/alert";
import { Button } from "@/components/ui/button";
import { SelectField, TextAreaField } from "@/components/ui/field";
import { Badge } from "@/components/ui/panel";
import { DispositionBadge } from "@/components/ui/status-badges";
import { applyServerErrors } from "@/lib/form-errors";
import { formatDateTime } from "@/lib/format";
import { useCreateDisposition } from "../api/create-disposition";
import { useSupersedeDisposition } from "../api/supersede-disposition";

type Props = { workshopId: string; unit: UnitDetail; canDecide: boolean; canSupersede: boolean };

export function DispositionsPanel({ workshopId, unit, canDecide, canSupersede }: Props) {
  const [superseding, setSuperseding] = useState(false);
  const needsDecision = unit.evaluation !== null && unit.evaluation.verdict !== "within_tolerance";
  const open = unit.batch.state !== "released";
  const standing = unit.dispositions.find((d) => d.id === unit.standingDispositionId) ?? null;
  const byId = new Map(unit.dispositions.map((d) => [d.id, d]));

  let action;
  if (!needsDecision) {
    action = <p className="text-ink-soft">{unit.evaluation ? "The unit is within tolerance: no disposition is needed." : "A disposition is decided once the unit has a verdict that is not within tolerance."}</p>;
  } else if (!open) {
    action = <p className="text-ink-soft">The batch is released; its dispositions are final.</p>;
  } else if (standing) {
    action =
      canSupersede && superseding ? (
        <DecisionForm key={standing.id} workshopId={workshopId} unitId={unit.id} supersedes={standing.id} onDone={() => setSuperseding(false)} />
      ) : (
        <div className="flex flex-wrap items-center gap-3">
          <p className="text-ink-soft">
            Standing decision: <DispositionBadge decision={standing.decision} />
          </p>
          {canSupersede ? (
            <Button variant="secondary" size="sm" onClick={() => setSuperseding(true)}>
              Supersede…
            </Button>
          ) : null}
        </div>
      );
  } else {
    action = canDecide ? <DecisionForm workshopId={workshopId} unitId={unit.id} /> : <p className="text-ink-soft">A quality member or the owner decides what happens to this unit.</p>;
  }

  return (
    <div className="flex flex-col gap-4">
      {action}
      {unit.dispositions.length > 0 ? (
        <ol aria-label="Disposition history" className="divide-y divide-line rounded-control border border-line">
          {unit.dispositions.map((d) => (
            <li key={d.id} className="px-4 py-3">
              <div className="flex flex-wrap items-center gap-2">
                <DispositionBadge decision={d.decision} />
                {d.id === unit.standingDispositionId ? <Badge tone="steel">Standing</Badge> : null}
                {d.supersededById ? <Badge>Superseded {byId.get(d.supersededById) ? formatDateTime(byId.get(d.supersededById)!.at) : ""}</Badge> : null}
                <span className="text-caption text-ink-soft">
                  {d.by?.name ?? "Unknown"} · {formatDateTime(d.at)}
                  {d.supersedesId && byId.get(d.supersedesId) ? ` · replaces “${dispositionLabels[byId.get(d.supersedesId)!.decision]}”` : ""}
                  {unit.evaluation && d.evaluationId && d.evaluationId !== unit.evaluation.id ? " · on an earlier evaluation" : ""}
                </span>
              </div>
              <p className={d.supersededById ? "mt-1 text-ink-soft" : "mt-1"}>{d.reason}</p>
            </li>
          ))}
        </ol>
      ) : null}
    </div>
  );
}

/** A first decision, or (with `supersedes`) the decision that replaces the standing one. */
function DecisionForm({ workshopId, unitId, supersedes, onDone }: { workshopId: string; unitId: string; supersedes?: string; onDone?: () => void }) {
  const create = useCreateDisposition(workshopId, unitId);
  const supersede = useSupersedeDisposition(workshopId, unitId);
  const [formError, setFormError] = useState<string | null>(null);
  const form = useForm<DispositionInput>({ resolver: zodResolver(dispositionInputSchema), defaultValues: { decision: "rework", reason: "" } });
  const { errors, isSubmitting } = form.formState;
  const onSubmit = form.handleSubmit(async (values) => {
    setFormError(null);
    try {
      if (supersedes) await supersede.mutateAsync({ dispositionId: supersedes, ...values });
      else await create.mutateAsync(values);
      form.reset({ decision: values.decision, reason: "" });
      onDone?.();
    } catch (error) {
      setFormError(applyServerErrors(error, form.setError, ["decision", "reason"]));
    }
  });
  return (
    <form onSubmit={onSubmit} noValidate aria-label={supersedes ? "Supersede the disposition" : "Disposition"} className="flex flex-col gap-3">
      {supersedes ? <p className="text-caption text-ink-soft">The new decision replaces the standing one; both stay in the unit's history with their reasons.</p> : null}
      {formError ? <Alert tone="error">{formError}</Alert> : null}
      <SelectField label={supersedes ? "New decision" : "Decision"} error={errors.decision?.message} {...form.register("decision")}>
        {dispositionDecisions.map((d) => (
          <option key={d} value={d}>
            {dispositionLabels[d]}
          </option>
        ))}
      </SelectField>
      <TextAreaField
        label={supersedes ? "Why the decision changes" : "Reason"}
        rows={2}
        hint="Recorded with your name in the ledger; it cannot be changed later."
        error={errors.reason?.message}
        {...form.register("reason")}
      />
      <div className="flex flex-wrap gap-2">
        <Button type="submit" pending={isSubmitting}>
          {supersedes ? "Record the new decision" : "Record disposition"}
        </Button>
        {onDone ? (
          <Button variant="quiet" onClick={onDone}>
            Cancel
          </Button>
        ) : null}
      </div>
    </form>
  );
}
