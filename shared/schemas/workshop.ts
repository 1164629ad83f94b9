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
