import { zodResolver } from "@hookform/resolvers/zod";
import { useState } from "react";
import { useForm } from "react-hook-form";
import { roleLabels, roleNames } from "@shared/permissions";
import { inviteMemberSchema, type InviteMemberInput } from "@shared/schemas/workshop";
import { Alert } from "@/components/ui/alert";
import { Button } from "@/components/ui/button";
import { InputField, SelectField } from "@/components/ui/field";
import { applyServerErrors } from "@/lib/form-errors";
import { useInviteMember } from "../api/invite-member";
import { roleDescriptions } from "./role-descriptions";

export function InviteMemberForm({ workshopId }: { workshopId: string }) {
  const invite = useInviteMember(workshopId);
  const [formError, setFormError] = useState<string | null>(null);
  const [sentTo, setSentTo] = useState<string | null>(null);
  const form = useForm<InviteMemberInput>({ resolver: zodResolver(inviteMemberSchema), defaultValues: { email: "", role: "maker" } });
  const { errors } = form.formState;
  const role = form.watch("role");

  const onSubmit = form.handleSubmit(async (values) => {
    setFormError(null);
    setSentTo(null);
    try {
      await invite.mutateAsync(values);
      setSentTo(values.email);
      form.reset({ email: "", role: values.role });
    } catch (error) {
      setFormError(applyServerErrors(error, form.setError, ["email", "role"]));
    }
  });

  return (
    <form onSubmit={onSubmit} noValidate className="flex flex-col gap-4" aria-label="Invite a member">
      {formError ? <Alert tone="error">{formError}</Alert> : null}
      {sentTo ? (
        <Alert tone="success">
          Invitation sent to {sentTo}. It waits under “Pending invitations” until they accept.
        </Alert>
      ) : null}
      <div className="grid gap-4 sm:grid-cols-[1fr_12rem]">
        <InputField label="E-mail address" type="email" autoComplete="off" error={errors.email?.message} {...form.register("email")} />
        <SelectField label="Role" error={errors.role?.message} {...form.register("role")}>
          {roleNames.map((name) => (
            <option key={name} value={name}>
              {roleLabels[name]}
            </option>
          ))}
        </SelectField>
      </div>
      <p className="text-caption text-ink-soft">{roleDescriptions[role] ?? ""}</p>
      <div>
        <Button type="submit" pending={form.formState.isSubmitting}>
          Send invitation
        </Button>
      </div>
    </form>
  );
}
