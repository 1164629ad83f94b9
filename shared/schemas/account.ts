/**
 * Account forms and the checks the server applies to what the sign-in library stores (server/auth-rules.ts
 * runs these same schemas on better-auth's bodies). The password minimum matches
 * `emailAndPassword.minPasswordLength` in server/auth.ts; the common-password check runs on the server only.
 */
import { z } from "zod";

export const passwordMinLength = 10;
export const passwordMaxLength = 128;
export const nameMaxLength = 100;
/** RFC 5321 §4.5.3.1.3: a path is at most 256 octets including the angle brackets, so an address is at most 254. */
export const emailMaxLength = 254;

export const emailSchema = z
  .string()
  .trim()
  .min(1, "Enter your e-mail address.")
  .max(emailMaxLength, `An e-mail address has at most ${emailMaxLength} characters.`)
  .pipe(z.email("This is not an e-mail address; it should look like name@example.com."));

export const nameSchema = z
  .string()
  .trim()
  .min(1, "Enter your name as colleagues should see it.")
  .max(nameMaxLength, `Keep the name to ${nameMaxLength} characters or fewer.`);

/** A new password (sign-up, reset). Not all whitespace: a password of spaces is one keystroke repeated. */
export const newPasswordSchema = z
  .string()
  .min(passwordMinLength, `Use at least ${passwordMinLength} characters.`)
  .max(passwordMaxLength, `Use at most ${passwordMaxLength} characters.`)
  .refine((p) => p.trim().length > 0, "A password of spaces only is too easy to guess; use letters, digits or words.");

export const signInSchema = z.object({
  email: emailSchema,
  password: z.string().min(1, "Enter your password."),
});
export type SignInInput = z.infer<typeof signInSchema>;

export const signUpSchema = z.object({
  name: nameSchema,
  email: emailSchema,
  password: newPasswordSchema,
});
export type SignUpInput = z.infer<typeof signUpSchema>;

export const forgotPasswordSchema = z.object({ email: emailSchema });
export type ForgotPasswordInput = z.infer<typeof forgotPasswordSchema>;

export const resetPasswordSchema = z
  .object({ password: newPasswordSchema, confirm: z.string() })
  .refine((v) => v.password === v.confirm, { message: "The two passwords differ; type the same one twice.", path: ["confirm"] });
export type ResetPasswordInput = z.infer<typeof resetPasswordSchema>;
