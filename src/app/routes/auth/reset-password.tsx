import { zodResolver } from "@hookform/resolvers/zod";
import { useState } from "react";
import { useForm } from "react-hook-form";
import { Link, useSearchParams } from "react-router";
import { passwordMinLength, resetPasswordSchema, type ResetPasswordInput } from "@shared/schemas/account";
import { AuthLayout } from "@/components/layouts/auth-layout";
import { Alert } from "@/components/ui/alert";
import { Button } from "@/components/ui/button";
import { InputField } from "@/components/ui/field";
import { paths } from "@/config/paths";
import { isApiError } from "@/lib/api-client";
import { resetPassword } from "@/lib/auth";
import { applyServerErrors } from "@/lib/form-errors";

/** The reset link lands here with a one-time token; the new password ends every earlier session. */
export function ResetPasswordRoute() {
  const [params] = useSearchParams();
  const token = params.get("token");
  const linkBroken = !token || params.get("error") !== null;
  const [done, setDone] = useState(false);
  const [formError, setFormError] = useState<string | null>(null);
  const form = useForm<ResetPasswordInput>({ resolver: zodResolver(resetPasswordSchema), defaultValues: { password: "", confirm: "" } });
  const { errors } = form.formState;

  const onSubmit = form.handleSubmit(async ({ password }) => {
    setFormError(null);
    try {
      await resetPassword(token!, password);
      setDone(true);
    } catch (error) {
      if (isApiError(error) && error.code === "invalid_token") {
        setFormError("This reset link has expired or was used already. Ask for a new one.");
        return;
      }
      setFormError(applyServerErrors(error, form.setError, ["password"]));
    }
  });

  return (
    <AuthLayout
      title="Choose a new password"
      footer={
        <Link to={paths.auth.signIn.getHref()} className="font-semibold text-steel-700 underline underline-offset-2">
          Back to sign in
        </Link>
      }
    >
      {linkBroken ? (
        <Alert tone="caution" title="This reset link does not work">
          It has expired (links work for one hour), was used already, or was not opened whole.{" "}
          <Link to={paths.auth.forgotPassword.getHref()} className="font-semibold underline underline-offset-2">
            Ask for a new link
          </Link>
          .
        </Alert>
      ) : done ? (
        <Alert tone="success" title="Your password is changed">
          Every device where you were signed in has been signed out.{" "}
          <Link to={paths.auth.signIn.getHref()} className="font-semibold underline underline-offset-2">
            Sign in with the new password
          </Link>
          .
        </Alert>
      ) : (
        <form onSubmit={onSubmit} noValidate className="flex flex-col gap-4" aria-label="Choose a new password">
          {formError ? <Alert tone="error">{formError}</Alert> : null}
          <InputField label="New password" type="password" autoComplete="new-password" hint={`At least ${passwordMinLength} characters.`} error={errors.password?.message} {...form.register("password")} />
          <InputField label="The same again" type="password" autoComplete="new-password" error={errors.confirm?.message} {...form.register("confirm")} />
          <Button type="submit" pending={form.formState.isSubmitting}>
            Save the new password
          </Button>
        </form>
      )}
    </AuthLayout>
  );
}
