import { zodResolver } from "@hookform/resolvers/zod";
import { useState } from "react";
import { useForm } from "react-hook-form";
import { passwordMinLength, signUpSchema, type SignUpInput } from "@shared/schemas/account";
import { Alert } from "@/components/ui/alert";
import { Button } from "@/components/ui/button";
import { InputField } from "@/components/ui/field";
import { useSignUp } from "@/lib/auth";
import { applyServerErrors } from "@/lib/form-errors";

type Props = {
  /** Where the confirmation link in the mail leads once the address is confirmed. */
  next?: string | null;
  /** Called with the address the confirmation link was sent to. */
  onSuccess: (email: string) => void | Promise<void>;
  submitLabel?: string;
};

export function SignUpForm({ next, onSuccess, submitLabel = "Create account" }: Props) {
  const signUp = useSignUp();
  const [formError, setFormError] = useState<string | null>(null);
  const form = useForm<SignUpInput>({
    resolver: zodResolver(signUpSchema),
    defaultValues: { name: "", email: "", password: "" },
  });
  const { errors } = form.formState;

  const onSubmit = form.handleSubmit(async (values) => {
    setFormError(null);
    try {
      await signUp.mutateAsync({ ...values, next });
      await onSuccess(values.email);
    } catch (error) {
      setFormError(applyServerErrors(error, form.setError, ["name", "email", "password"]));
    }
  });

  return (
    <form onSubmit={onSubmit} noValidate className="flex flex-col gap-4" aria-label="Create an account">
      {formError ? <Alert tone="error">{formError}</Alert> : null}
      <InputField label="Your name" autoComplete="name" error={errors.name?.message} {...form.register("name")} />
      <InputField label="E-mail" type="email" autoComplete="email" error={errors.email?.message} {...form.register("email")} />
      <InputField
        label="Password"
        type="password"
        autoComplete="new-password"
        hint={`At least ${passwordMinLength} characters; a few unrelated words are easy to remember and hard to guess.`}
        error={errors.password?.message}
        {...form.register("password")}
      />
      <Button type="submit" pending={form.formState.isSubmitting}>
        {submitLabel}
      </Button>
    </form>
  );
}
