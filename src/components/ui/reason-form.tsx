/**
 * A small form that asks why (at least 3 characters) before a correction that cannot be undone:
 * voiding a strike, withdrawing a certificate. Server field messages land on the field.
 */
import { zodResolver } from "@hookform/resolvers/zod";
import { useState, type ReactNode } from "react";
import { useForm } from "react-hook-form";
import { z } from "zod";
import { reasonSchema } from "@shared/schemas/reason";
import { applyServerErrors } from "@/lib/form-errors";
import { Alert } from "./alert";
import { Button } from "./button";
import { TextAreaField } from "./field";

const schema = z.object({ reason: reasonSchema });

type Props = {
  /** The form's accessible name, e.g. "Void F-0008-take-2.wav". */
  name: string;
  /** What will happen, in plain words, above the field. */
  warning: ReactNode;
  label: string;
  hint?: string;
  submitLabel: string;
  onSubmit: (reason: string) => Promise<unknown>;
  onCancel: () => void;
};

export function ReasonForm({ name, warning, label, hint, submitLabel, onSubmit, onCancel }: Props) {
  const [formError, setFormError] = useState<string | null>(null);
  const form = useForm<z.infer<typeof schema>>({ resolver: zodResolver(schema), defaultValues: { reason: "" } });
  const submit = form.handleSubmit(async ({ reason }) => {
    setFormError(null);
    try {
      await onSubmit(reason);
    } catch (error) {
      setFormError(applyServerErrors(error, form.setError, ["reason"]));
    }
  });
  return (
    <form onSubmit={submit} noValidate aria-label={name} className="flex flex-col gap-3 rounded-control border border-rust-300 bg-rust-50/50 p-3">
      <p className="text-caption text-ink">{warning}</p>
      {formError ? <Alert tone="error">{formError}</Alert> : null}
      <TextAreaField label={label} rows={2} hint={hint} error={form.formState.errors.reason?.message} {...form.register("reason")} />
      <div className="flex flex-wrap gap-2">
        <Button type="submit" variant="danger" pending={form.formState.isSubmitting}>
          {submitLabel}
        </Button>
        <Button variant="quiet" onClick={onCancel}>
          Cancel
        </Button>
      </div>
    </form>
  );
}
