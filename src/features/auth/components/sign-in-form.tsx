import { zodResolver } from "@hookform/resolvers/zod";
import { useState } from "react";
import { useForm } from "react-hook-form";
import { Link } from "react-router";
import { signInSchema, type SignInInput } from "@shared/schemas/account";
import { Alert } from "@/components/ui/alert";
import { Button } from "@/components/ui/button";
import { InputField } from "@/components/ui/field";
import { paths } from "@/config/paths";
import { isApiError } from "@/lib/api-client";
import { useSignIn } from "@/lib/auth";
import { applyServerErrors } from "@/lib/form-errors";

type Props = {
  /** Where a fresh confirmation link should lead, when the address is not confirmed yet. */
  next?: string | null;
  onSuccess: () => void | Promise<void>;
  submitLabel?: string;
};

export function SignInForm({ next, onSuccess, submitLabel = "Sign in" }: Props) {
  const signIn = useSignIn();
  const [formError, setFormError] = useState<string | null>(null);
  const [unconfirmed, setUnconfirmed] = useState<string | null>(null);
  const form = useForm<SignInInput>({
    resolver: zodResolver(signInSchema),
    defaultValues: { email: "", password: "" },
  });
  const { errors } = form.formState;

  const onSubmit = form.handleSubmit(async (values) => {
    setFormError(null);
    setUnconfirmed(null);
    try {
      await signIn.mutateAsync({ ...values, next });
      await onSuccess();
    } catch (error) {
      if (isApiError(error) && error.status === 401) {
        setFormError("The e-mail address or the password is wrong. Check both and try again.");
        return;
      }
      if (isApiError(error) && error.code === "email_not_verified") {
        setUnconfirmed(values.email);
        return;
      }
      setFormError(applyServerErrors(error, form.setError, ["email", "password"]));
    }
  });

  return (
    <form onSubmit={onSubmit} noValidate className="flex flex-col gap-4" aria-label="Sign in">
      {formError ? <Alert tone="error">{formError}</Alert> : null}
      {unconfirmed ? (
        <Alert tone="caution" title="Confirm your e-mail address first">
          We have just sent a new confirmation link to {unconfirmed}. Open it on this device to finish signing in; it is valid for 24 hours.
        </Alert>
      ) : null}
      <InputField label="E-mail" type="email" autoComplete="email" error={errors.email?.message} {...form.register("email")} />
      <InputField label="Password" type="password" autoComplete="current-password" error={errors.password?.message} {...form.register("password")} />
      <Button type="submit" pending={form.formState.isSubmitting}>
        {submitLabel}
      </Button>
      <Link to={paths.auth.forgotPassword.getHref()} className="self-start text-caption font-semibold text-steel-700 underline underline-offset-2">
        Forgot your password?
      </Link>
    </form>
  );
}
