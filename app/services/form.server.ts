import { data } from "react-router";
import type { z } from "zod";
import { zodFieldErrors, type FieldErrors } from "~/lib/http";

/** Reads a form body; a body that is not a form is the client's mistake (400), not ours. */
export async function readForm(request: Request): Promise<FormData> {
  try {
    return await request.formData();
  } catch {
    throw data({ error: "The form could not be read. Send it as a normal web form." }, { status: 400 });
  }
}

/** Text values of a form, for re-filling the form after an error. Files and passwords are left out. */
export function formValues(form: FormData, omit: string[] = ["password", "confirmPassword"]): Record<string, string> {
  const values: Record<string, string> = {};
  for (const [key, value] of form) {
    if (typeof value === "string" && !omit.includes(key)) values[key] = value.slice(0, 10_000);
  }
  return values;
}

export type FormFailure = { errors: FieldErrors; values: Record<string, string> };

/** Parses a form with a zod schema: the data, or a 400 response body with field errors and values. */
export function parseFormWith<S extends z.ZodType>(
  schema: S,
  form: FormData,
): { ok: true; data: z.infer<S> } | { ok: false; failure: FormFailure } {
  const raw: Record<string, unknown> = {};
  for (const key of new Set(form.keys())) {
    const all = form.getAll(key);
    raw[key] = all.length > 1 ? all : all[0];
  }
  const result = schema.safeParse(raw);
  if (result.success) return { ok: true, data: result.data };
  return { ok: false, failure: { errors: zodFieldErrors(result.error.issues), values: formValues(form) } };
}

export function badRequest(failure: FormFailure, init?: ResponseInit) {
  return data(failure, { status: 400, ...init });
}
