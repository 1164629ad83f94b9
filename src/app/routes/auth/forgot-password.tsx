import { zodResolver } from "@hookform/resolvers/zod";
import { useState } from "react";
import { useForm } from "react-hook-form";
import { Link } from "react-router";
import { forgotPasswordSchema, type ForgotPasswordInput } from "@shared/schemas/account";
import { AuthLayout } from "@/components/layouts/auth-layout";
import { Alert } from "@/components/ui/alert";
import { Button } from "@/components/ui/button";
import { InputField } from "@/components/ui/field";
import { paths } from "@/config/paths";
import { requestPasswordReset } from "@/lib/auth";
import { applyServerErrors } from "@/lib/form-errors";

/** Asks for a reset link by e-mail. The answer never says whether the address has an account. */
export function ForgotPasswordRoute() {
  const [sentTo, setSentTo] = useState<string | null>(null);
  const [formError, setFormError] = useState<string | null>(null);
  const form = useForm<ForgotPasswordInput>({ resolver: zodResolver(forgotPasswordSchema), defaultValues: { email: "" } });

  const onSubmit = form.handleSubmit(async ({ email }) => {
    setFormError(null);
    try {
      await requestPasswordReset(email);
      setSentTo(email);
    } catch (error) {
      setFormError(applyServerErrors(error, form.setError, ["email"]));
    }
  });

  return (
    <AuthLayout
      title="Reset your password"
      intro="Give the e-mail address you sign in with. We send a link to choose a new password."
      footer={
        <Link to={paths.auth.signIn.getHref()} className="font-semibold text-steel-700 underline underline-offset-2">
          Back to sign in
        </Link>
      }
    >
      {sentTo ? (
        <Alert tone="success" title="Check your mail">
          If {sentTo} has a Tinelog account, a link to choose a new password is on its way. It works once, for one hour. No mail after a few minutes? Look in
          the spam folder, or ask again.
        </Alert>
      ) : (
        <form onSubmit={onSubmit} noValidate className="flex flex-col gap-4" aria-label="Reset your password">
          {formError ? <Alert tone="error">{formError}</Alert> : null}
          <InputField label="E-mail" type="email" autoComplete="email" error={form.formState.errors.email?.message} {...form.register("email")} />
          <Button type="submit" pending={form.formState.isSubmitting}>
            Send the link
          </Button>
        </form>
      )}
    </AuthLayout>
  );
}
