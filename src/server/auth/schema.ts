/**
 * Inputs of the sign-in and password forms (shared by pages, route handlers and services).
 * Imports nothing but zod, so client forms can use the same rules as the server.
 */
import "@/src/lib/zod-jitless";
import { z } from "zod";

export const MIN_PASSWORD_LENGTH = 10;

export const EmailSchema = z
  .string({ error: "Enter an e-mail address." })
  .trim()
  .toLowerCase()
  .pipe(z.email({ error: "Enter a valid e-mail address." }).max(254, { error: "At most 254 characters." }));

export const SignInSchema = z.object({
  email: EmailSchema,
  password: z.string({ error: "Enter your password." }).min(1, { error: "Enter your password." }).max(1024),
});

export const NewPasswordSchema = z
  .string({ error: "Enter a password." })
  .min(MIN_PASSWORD_LENGTH, { error: `At least ${MIN_PASSWORD_LENGTH} characters.` })
  .max(1024, { error: "At most 1024 characters." });

export const PasswordResetRequestSchema = z.object({ email: EmailSchema });

export const PasswordResetSchema = z
  .object({ password: NewPasswordSchema, confirm: z.string({ error: "Repeat the password." }) })
  .refine((v) => v.password === v.confirm, { path: ["confirm"], error: "The passwords do not match." });
