import { z } from "zod";

export const email = z.string().trim().toLowerCase().max(254, "Use at most 254 characters").pipe(z.email("Enter a valid e-mail address"));

/** NIST SP 800-63B: at least 8 characters, no composition rules, long passphrases allowed. */
export const newPassword = z
  .string()
  .min(10, "Use at least 10 characters")
  .max(200, "Use at most 200 characters");

export const personName = z.string().trim().min(1, "Enter your name").max(120, "Use at most 120 characters");

export const signUpSchema = z
  .object({
    name: personName,
    email,
    password: newPassword,
    confirmPassword: z.string(),
  })
  .refine((v) => v.password === v.confirmPassword, { message: "The two passwords differ", path: ["confirmPassword"] });

export const resetSchema = z
  .object({ token: z.string().min(10).max(200), password: newPassword, confirmPassword: z.string() })
  .refine((v) => v.password === v.confirmPassword, { message: "The two passwords differ", path: ["confirmPassword"] });

export const forgotSchema = z.object({ email });
