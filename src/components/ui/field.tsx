import clsx from "clsx";
import { forwardRef, useId, type InputHTMLAttributes, type ReactNode, type SelectHTMLAttributes, type TextareaHTMLAttributes } from "react";

const control =
  "block w-full min-h-touch rounded-control border bg-surface px-3 text-body text-ink placeholder:text-ink-faint disabled:bg-sunken disabled:text-ink-soft";
// A select is :read-only in CSS terms, so the "fixed value" look applies to text inputs only.
const inputOnly = "read-only:bg-sunken read-only:text-ink-soft";

type FieldShellProps = { id: string; label: string; hint?: ReactNode; error?: string; children: ReactNode };

/** Label above, hint and error below, wired with aria-describedby so screen readers read them. */
function FieldShell({ id, label, hint, error, children }: FieldShellProps) {
  return (
    <div className="flex flex-col gap-1.5">
      <label htmlFor={id} className="text-caption font-semibold text-ink">
        {label}
      </label>
      {children}
      {hint && !error ? (
        <p id={`${id}-hint`} className="text-caption text-ink-faint">
          {hint}
        </p>
      ) : null}
      {error ? (
        <p id={`${id}-error`} className="text-caption font-medium text-rust-700">
          {error}
        </p>
      ) : null}
    </div>
  );
}

type InputFieldProps = InputHTMLAttributes<HTMLInputElement> & { label: string; hint?: ReactNode; error?: string };

export const InputField = forwardRef<HTMLInputElement, InputFieldProps>(function InputField({ label, hint, error, id, className, ...rest }, ref) {
  const generated = useId();
  const inputId = id ?? generated;
  return (
    <FieldShell id={inputId} label={label} hint={hint} error={error}>
      <input
        ref={ref}
        id={inputId}
        aria-invalid={error ? true : undefined}
        aria-describedby={error ? `${inputId}-error` : hint ? `${inputId}-hint` : undefined}
        className={clsx(control, inputOnly, error ? "border-rust-600" : "border-line-strong", className)}
        {...rest}
      />
    </FieldShell>
  );
});

type SelectFieldProps = SelectHTMLAttributes<HTMLSelectElement> & { label: string; hint?: ReactNode; error?: string };

export const SelectField = forwardRef<HTMLSelectElement, SelectFieldProps>(function SelectField({ label, hint, error, id, className, children, ...rest }, ref) {
  const generated = useId();
  const selectId = id ?? generated;
  return (
    <FieldShell id={selectId} label={label} hint={hint} error={error}>
      <select
        ref={ref}
        id={selectId}
        aria-invalid={error ? true : undefined}
        aria-describedby={error ? `${selectId}-error` : hint ? `${selectId}-hint` : undefined}
        className={clsx(control, "pr-8", error ? "border-rust-600" : "border-line-strong", className)}
        {...rest}
      >
        {children}
      </select>
    </FieldShell>
  );
});

type TextAreaFieldProps = TextareaHTMLAttributes<HTMLTextAreaElement> & { label: string; hint?: ReactNode; error?: string };

export const TextAreaField = forwardRef<HTMLTextAreaElement, TextAreaFieldProps>(function TextAreaField({ label, hint, error, id, className, rows = 3, ...rest }, ref) {
  const generated = useId();
  const areaId = id ?? generated;
  return (
    <FieldShell id={areaId} label={label} hint={hint} error={error}>
      <textarea
        ref={ref}
        id={areaId}
        rows={rows}
        aria-invalid={error ? true : undefined}
        aria-describedby={error ? `${areaId}-error` : hint ? `${areaId}-hint` : undefined}
        className={clsx("block w-full rounded-control border bg-surface px-3 py-2 text-body text-ink placeholder:text-ink-faint", error ? "border-rust-600" : "border-line-strong", className)}
        {...rest}
      />
    </FieldShell>
  );
});

type CheckboxFieldProps = Omit<InputHTMLAttributes<HTMLInputElement>, "type"> & { label: string; error?: string };

export const CheckboxField = forwardRef<HTMLInputElement, CheckboxFieldProps>(function CheckboxField({ label, error, id, ...rest }, ref) {
  const generated = useId();
  const boxId = id ?? generated;
  return (
    <div>
      <label htmlFor={boxId} className="inline-flex min-h-9 items-center gap-2 text-body">
        <input ref={ref} id={boxId} type="checkbox" className="size-5 accent-steel-600" aria-invalid={error ? true : undefined} {...rest} />
        {label}
      </label>
      {error ? <p className="text-caption font-medium text-rust-700">{error}</p> : null}
    </div>
  );
});
