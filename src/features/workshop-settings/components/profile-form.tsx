/** The workshop's profile: printed on every certificate and used as the certificate mail's From and Reply-To. */
import { zodResolver } from "@hookform/resolvers/zod";
import { useState } from "react";
import { useForm } from "react-hook-form";
import { certificateNumber } from "@shared/schemas/certificate";
import { workshopProfileSchema } from "@shared/schemas/workshop";
import { Alert } from "@/components/ui/alert";
import { Button } from "@/components/ui/button";
import { InputField, TextAreaField } from "@/components/ui/field";
import { applyServerErrors } from "@/lib/form-errors";
import { profileGaps, type WorkshopProfile } from "../api/get-workshop";
import { useUpdateProfile } from "../api/update-profile";

const fields = ["address", "sendingEmail", "qualityEmail", "certificatePrefix", "clockTolerancePpm", "thermometerToleranceC", "tempCoefficientTolerancePercent"] as const;

export function ProfileForm({ workshopId, profile }: { workshopId: string; profile: WorkshopProfile }) {
  const update = useUpdateProfile(workshopId);
  const [formError, setFormError] = useState<string | null>(null);
  const [saved, setSaved] = useState(false);
  const form = useForm<WorkshopProfile>({ resolver: zodResolver(workshopProfileSchema), defaultValues: profile });
  const { errors, isSubmitting } = form.formState;
  const gaps = profileGaps(form.watch());

  const onSubmit = form.handleSubmit(async (values) => {
    setFormError(null);
    setSaved(false);
    try {
      await update.mutateAsync(values);
      form.reset(values);
      setSaved(true);
    } catch (error) {
      setFormError(applyServerErrors(error, form.setError, fields));
    }
  });

  return (
    <form onSubmit={onSubmit} noValidate aria-label="Workshop profile" className="flex flex-col gap-4">
      {formError ? <Alert tone="error">{formError}</Alert> : null}
      {saved ? <Alert tone="success">Profile saved. New certificates use it from now on.</Alert> : null}
      {gaps.length > 0 ? <Alert tone="caution">Certificates cannot be issued until the profile is complete: add the {gaps.join(", ")}.</Alert> : null}
      <TextAreaField label="Postal address" rows={3} hint="Printed on every certificate; one line per row." error={errors.address?.message} {...form.register("address")} />
      <div className="grid gap-4 sm:grid-cols-2">
        <InputField label="Sending e-mail" type="email" hint="Certificates are sent from this address." error={errors.sendingEmail?.message} {...form.register("sendingEmail")} />
        <InputField label="Quality e-mail" type="email" hint="Customers' replies go here." error={errors.qualityEmail?.message} {...form.register("qualityEmail")} />
        <InputField
          label="Certificate prefix"
          hint={`Starts every certificate number: the first this year is ${certificateNumber(form.watch("certificatePrefix")?.trim() || "BTW", new Date().getFullYear(), 1)}.`}
          error={errors.certificatePrefix?.message}
          {...form.register("certificatePrefix")}
        />
      </div>
      <fieldset className="grid gap-4 sm:grid-cols-2">
        <legend className="mb-2 text-body font-semibold">Assumed tolerances</legend>
        <p className="text-caption text-ink-soft sm:col-span-2">Used for a recorder or thermometer that has no valid calibration (see Instruments); a calibrated instrument brings its own uncertainty instead.</p>
        <InputField
          label="Recording clock tolerance (± ppm)"
          type="number"
          step="any"
          inputMode="decimal"
          hint="Every measured frequency scales with the recording device's clock. 50 ppm assumes an uncalibrated audio interface; calibrate it against a reference tone to use less."
          error={errors.clockTolerancePpm?.message}
          {...form.register("clockTolerancePpm", { valueAsNumber: true })}
        />
        <InputField
          label="Thermometer tolerance (± °C)"
          type="number"
          step="any"
          inputMode="decimal"
          hint="Enters the uncertainty of the temperature correction. Use the thermometer's stated accuracy."
          error={errors.thermometerToleranceC?.message}
          {...form.register("thermometerToleranceC", { valueAsNumber: true })}
        />
        <InputField
          label="Temperature coefficient known to (± %)"
          type="number"
          step="any"
          inputMode="decimal"
          hint="How well the specifications' temperature coefficients fit your parts. 20 % is a typical starting value for a handbook figure — measure your own parts at two temperatures to know it better."
          error={errors.tempCoefficientTolerancePercent?.message}
          {...form.register("tempCoefficientTolerancePercent", { valueAsNumber: true })}
        />
        <p className="text-caption text-ink-faint sm:col-span-2">All are taken as rectangular (GUM §4.3.7) and apply to evaluations made after saving; earlier ones keep the values they were made with.</p>
      </fieldset>
      <div>
        <Button type="submit" pending={isSubmitting}>
          Save profile
        </Button>
      </div>
    </form>
  );
}
