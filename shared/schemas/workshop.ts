/** Creating a workshop (a better-auth organization) and inviting people into it. */
import { z } from "zod";
import { roleNames } from "../permissions.ts";

/** Lower-case letters, digits and single hyphens: safe in a URL and in file names. */
export const slugPattern = /^[a-z0-9]+(?:-[a-z0-9]+)*$/;

/** "Brightwater Tuning Works" → "brightwater-tuning-works". Accents are dropped, not transliterated. */
export function slugify(name: string): string {
  return name
    .normalize("NFKD")
    .replace(/[\u0300-\u036f]/g, "")
    .toLowerCase()
    .replace(/[^a-z0-9]+/g, "-")
    .replace(/^-+|-+$/g, "")
    .slice(0, 48)
    .replace(/-+$/g, "");
}

export const createWorkshopSchema = z.object({
  name: z.string().trim().min(2, "Give the workshop a name of at least 2 characters.").max(80, "Keep the name under 80 characters."),
  slug: z
    .string()
    .trim()
    .min(2, "The short name needs at least 2 characters.")
    .max(48, "Keep the short name under 48 characters.")
    .regex(slugPattern, "Use lower-case letters, digits and hyphens only, e.g. brightwater-tuning."),
});
export type CreateWorkshopInput = z.infer<typeof createWorkshopSchema>;

export const memberRoleSchema = z.enum(roleNames, "Choose a role: owner, qa or maker.");

export const inviteMemberSchema = z.object({
  email: z
    .string()
    .trim()
    .min(1, "Enter the e-mail address to send the invitation to.")
    .pipe(z.email("This is not an e-mail address; it should look like name@example.com.")),
  role: memberRoleSchema,
});
export type InviteMemberInput = z.infer<typeof inviteMemberSchema>;

const optionalEmail = z.union([z.literal(""), z.email("Enter a valid e-mail address, like quality@example.com")]);

/**
 * The workshop's profile (printed on certificates, used as the certificate mail's From and Reply-To) and
 * the two instrument tolerances that enter every measured frequency's uncertainty. Form and route use it.
 */
export const workshopProfileSchema = z.object({
  address: z.string().trim().max(500, "At most 500 characters"),
  sendingEmail: optionalEmail,
  qualityEmail: optionalEmail,
  certificatePrefix: z.string().trim().regex(/^[A-Z0-9-]{1,12}$/, "Capital letters, digits and - only, at most 12 (e.g. BTW)"),
  /** ± half-width of the recording device's sample-clock error, ppm (50 when not calibrated: an assumption). */
  clockTolerancePpm: z.number({ error: "Give the clock tolerance in ppm" }).min(0, "0 ppm or more").max(1000, "At most 1000 ppm"),
  /** ± half-width of the thermometer's error, °C. */
  thermometerToleranceC: z.number({ error: "Give the thermometer tolerance in °C" }).min(0, "0 °C or more").max(10, "At most 10 °C"),
  /** ± how well the specs' temperature coefficients are known, % of the coefficient (20 when not measured: an assumption). */
  tempCoefficientTolerancePercent: z.number({ error: "Give the coefficient's tolerance in %" }).min(0, "0 % or more").max(100, "At most 100 %").optional().default(20),
});
export type WorkshopProfileInput = z.input<typeof workshopProfileSchema>;
