import { data } from "react-router";

/** Field errors as returned by actions: `{ errors: { field: "message" } }`, status 400. */
export type FieldErrors = Record<string, string | undefined>;

export function zodFieldErrors(issues: ReadonlyArray<{ path: PropertyKey[]; message: string }>): FieldErrors {
  const errors: FieldErrors = {};
  for (const issue of issues) {
    const key = issue.path.map(String).join(".") || "form";
    errors[key] ??= issue.message;
  }
  return errors;
}

/** Throw a response with a precise status when a condition fails (404, 403, 409 …). */
export function invariantResponse(
  condition: unknown,
  message: string,
  status = 400,
): asserts condition {
  if (!condition) throw data({ error: message }, { status });
}

export function notFound(message = "Not found"): never {
  throw data({ error: message }, { status: 404 });
}

/** JSON error body used across the API: names the offending field. */
export function jsonError(error: string, field: string | undefined, status = 400, headers?: HeadersInit) {
  return Response.json(field ? { error, field } : { error }, { status, headers });
}
