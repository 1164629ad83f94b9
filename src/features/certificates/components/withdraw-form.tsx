/** Withdrawing a certificate (unit or batch): a reason, and a plain warning of what happens. */
import { zodResolver } from "@hookform/resolvers/zod";
import { useState } from "react";
import { useForm } from "react-hook-form";
import { withdrawCertificateSchema, type WithdrawCertificateInput } from "@shared/schemas/corrections";
import { Alert } from "@/components/ui/alert";
import { Button } from "@/components/ui/button";
import { TextAreaField } from "@/components/ui/field";
import { applyServerErrors } from "@/lib/form-errors";
import { useWithdrawCertificate } from "../api/withdraw-certificate";

export function WithdrawForm({ workshopId, number, recipient, onDone }: { workshopId: string; number: string; recipient: string; onDone: () => void }) {
  const mutation = useWithdrawCertificate(workshopId);
  const [formError, setFormError] = useState<string | null>(null);
  const form = useForm<WithdrawCertificateInput>({ resolver: zodResolver(withdrawCertificateSchema), defaultValues: { reason: "" } });
  const onSubmit = form.handleSubmit(async (values) => {
    setFormError(null);
    try {
      await mutation.mutateAsync({ number, ...values });
      onDone();
    } catch (error) {
      setFormError(applyServerErrors(error, form.setError, ["reason"]));
    }
  });
  return (
    <form onSubmit={onSubmit} noValidate aria-label={`Withdraw certificate ${number}`} className="flex flex-col gap-3 rounded-control border border-rust-300 bg-rust-50/50 p-3">
      <p className="text-caption text-ink">
        The certificate stays on record, but its verification page will say it was withdrawn, when and why, and its PDF will carry a WITHDRAWN mark. {recipient} is told by
        e-mail. This cannot be undone.
      </p>
      {formError ? <Alert tone="error">{formError}</Alert> : null}
      <TextAreaField label="Why is it withdrawn?" rows={2} hint="Shown on the public verification page: no names or contact details." error={form.formState.errors.reason?.message} {...form.register("reason")} />
      <div className="flex flex-wrap gap-2">
        <Button type="submit" variant="danger" pending={form.formState.isSubmitting}>
          Withdraw {number}
        </Button>
        <Button variant="quiet" onClick={onDone}>
          Cancel
        </Button>
      </div>
    </form>
  );
}
