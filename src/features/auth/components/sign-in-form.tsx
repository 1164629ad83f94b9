import { zodResolver } from "@hookform/resolvers/zod";
import { useState } from "react";
import { useForm } from "react-hook-form";
import { signInSchema, type SignInInput } from "@shared/schemas/account";
import { Alert } from "@/components/ui/alert";
import { Button } from "@/components/ui/button";
import { InputField } from "@/components/ui/field";
import { isApiError } from "@/lib/api-client";
import { useSignIn } from "@/lib/auth";
import { applyServerErrors } from "@/lib/form-errors";

type Props = {
  /** When set, the e-mail is shown but cannot be changed (an invitation is for one address). */
  lockedEmail?: string;
  onSuccess: () => void | Promise<void>;
  submitLabel?: string;
};

export function SignInForm({ lockedEmail, onSuccess, submitLabel = "Sign in" }: Props) {
  const signIn = useSignIn();
  const [formError, setFormError] = useState<string | null>(null);
  const form = useForm<SignInInput>({
    resolver: zodResolver(signInSchema),
    defaultValues: { email: lockedEmail ?? "", password: "" },
  });
  const { errors } = form.formState;

  const onSubmit = form.handleSubmit(async (values) => {
    setFormError(null);
    try {
      await signIn.mutateAsync(values);
      await onSuccess();
    } catch (error) {
      if (isApiError(error) && error.status === 401) {
        setFormError("The e-mail address or the password is wrong. Check both and try again.");
        return;
      }
      setFormError(applyServerErrors(error, form.setError, ["email", "password"]));
    }
  });

  return (
    <form onSubmit={onSubmit} noValidate className="flex flex-col gap-4" aria-label="Sign in">
      {formError ? <Alert tone="error">{formError}</Alert> : null}
      <InputField label="E-mail" type="email" autoComplete="email" readOnly={!!lockedEmail} error={errors.email?.message} {...form.register("email")} />
      <InputField label="Password" type="password" autoComplete="current-password" error={errors.password?.message} {...form.register("password")} />
      <Button type="submit" pending={form.formState.isSubmitting}>
        {submitLabel}
      </Button>
    </form>
  );
}
