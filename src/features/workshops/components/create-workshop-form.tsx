import { zodResolver } from "@hookform/resolvers/zod";
import { useState, type ChangeEvent } from "react";
import { useForm } from "react-hook-form";
import { createWorkshopSchema, slugify, type CreateWorkshopInput } from "@shared/schemas/workshop";
import { Alert } from "@/components/ui/alert";
import { Button } from "@/components/ui/button";
import { InputField } from "@/components/ui/field";
import { isApiError } from "@/lib/api-client";
import { applyServerErrors } from "@/lib/form-errors";
import { useCreateWorkshop } from "../api/create-workshop";

export function CreateWorkshopForm({ onCreated }: { onCreated: () => void | Promise<void> }) {
  const createWorkshop = useCreateWorkshop();
  const [formError, setFormError] = useState<string | null>(null);
  // The short name follows the name until the person edits it themselves.
  const [slugTouched, setSlugTouched] = useState(false);
  const form = useForm<CreateWorkshopInput>({ resolver: zodResolver(createWorkshopSchema), defaultValues: { name: "", slug: "" } });
  const { errors } = form.formState;
  const nameField = form.register("name", {
    onChange: (event: ChangeEvent<HTMLInputElement>) => {
      if (!slugTouched) form.setValue("slug", slugify(event.target.value), { shouldValidate: form.formState.isSubmitted });
    },
  });
  const slugField = form.register("slug", { onChange: () => setSlugTouched(true) });

  const onSubmit = form.handleSubmit(async (values) => {
    setFormError(null);
    try {
      await createWorkshop.mutateAsync(values);
      await onCreated();
    } catch (error) {
      // better-auth answers a taken slug with 400 ORGANIZATION_ALREADY_EXISTS / SLUG_IS_TAKEN.
      if (isApiError(error) && /exist|taken/i.test(error.code + error.message)) {
        form.setError("slug", { type: "server", message: "Another workshop already uses this short name. Choose a different one." });
        return;
      }
      setFormError(applyServerErrors(error, form.setError, ["name", "slug"]));
    }
  });

  return (
    <form onSubmit={onSubmit} noValidate className="flex flex-col gap-4" aria-label="Create your workshop">
      {formError ? <Alert tone="error">{formError}</Alert> : null}
      <InputField label="Workshop name" autoComplete="organization" error={errors.name?.message} {...nameField} />
      <InputField
        label="Short name"
        hint="Lower-case letters, digits and hyphens. Used in links and file names."
        error={errors.slug?.message}
        autoCapitalize="none"
        spellCheck={false}
        {...slugField}
      />
      <Button type="submit" pending={form.formState.isSubmitting}>
        Create workshop
      </Button>
    </form>
  );
}
