/**
 * Sign-in and sign-up forms (client side; better-auth validates the same fields on the server).
 * The password minimum matches `emailAndPassword.minPasswordLength` in server/auth.ts.
 */
import { z } from "zod";

export const passwordMinLength = 10;
export const passwordMaxLength = 128;

const email = z
  .string()
  .trim()
  .min(1, "Enter your e-mail address.")
  .pipe(z.email("This is not an e-mail address; it should look like name@example.com."));

export const signInSchema = z.object({
  email,
  password: z.string().min(1, "Enter your password."),
});
export type SignInInput = z.infer<typeof signInSchema>;

export const signUpSchema = z.object({
  name: z.string().trim().min(1, "Enter your name as colleagues should see it.").max(100, "Keep the name under 100 characters."),
  email,
  password: z
    .string()
    .min(passwordMinLength, `Use at least ${passwordMinLength} characters.`)
    .max(passwordMaxLength, `Use at most ${passwordMaxLength} characters.`),
});
export type SignUpInput = z.infer<typeof signUpSchema>;
