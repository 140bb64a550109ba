// Subscriber addresses: one plain address, nothing that could add a header or a recipient.
import { z } from "zod";

export const MAX_EMAIL_LENGTH = 254; // RFC 5321 §4.5.3.1.3 path limit, less the brackets

/** Characters that could inject a header or a second recipient, or are never in a plain address. */
const FORBIDDEN = /[\r\n\0,;<>()\[\]\\"\s]/;

export function emailProblem(raw: string): string | null {
  const value = raw.trim();
  if (!value) return "Enter your e-mail address.";
  if (value.length > MAX_EMAIL_LENGTH) return `An e-mail address has at most ${MAX_EMAIL_LENGTH} characters.`;
  if (/[\r\n]/.test(raw)) return "An e-mail address cannot contain line breaks.";
  if (/[,;]/.test(value) || (value.match(/@/g) ?? []).length > 1) return "Enter one e-mail address only.";
  if (FORBIDDEN.test(value)) return "Enter a plain e-mail address such as skipper@example.org (no name, spaces or brackets).";
  if (!z.email().safeParse(value).success) return "Enter a valid e-mail address such as skipper@example.org.";
  return null;
}

export const normaliseSubscriberEmail = (email: string) => email.trim().toLowerCase();

/** Zod field for a subscriber address, lower-cased. */
export const subscriberEmail = z
  .string({ error: "Enter your e-mail address." })
  .superRefine((v, ctx) => {
    const problem = emailProblem(v);
    if (problem) ctx.addIssue({ code: "custom", message: problem });
  })
  .transform(normaliseSubscriberEmail);
