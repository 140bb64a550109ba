import { data, Form, Link, useNavigation } from "react-router";
import type { Route } from "./+types/sign-in";
import { Field, FormError } from "~/components/forms";
import { authenticateForm, createUserSession, requireAnonymous, safeRedirect, SignInError } from "~/services/auth.server";
import { readForm } from "~/services/form.server";

export const meta: Route.MetaFunction = () => [{ title: "Sign in · Tidewire" }];

// Document responses take their headers from here: keep the action's Retry-After.
export const headers: Route.HeadersFunction = ({ actionHeaders, loaderHeaders }) => (actionHeaders.has("Retry-After") ? actionHeaders : loaderHeaders);

export async function loader({ request }: Route.LoaderArgs) {
  await requireAnonymous(request);
  return { redirectTo: safeRedirect(new URL(request.url).searchParams.get("redirectTo"), "") };
}

export async function action({ request, context }: Route.ActionArgs) {
  await requireAnonymous(request);
  const form = await readForm(request.clone());
  const email = String(form.get("email") ?? "").slice(0, 254);
  const redirectTo = safeRedirect(form.get("redirectTo"), "/account");
  try {
    const user = await authenticateForm(request, context);
    return createUserSession(request, user, redirectTo);
  } catch (error) {
    if (error instanceof SignInError) {
      return data(
        { errors: { [error.field]: error.message } as Record<string, string>, values: { email } },
        { status: error.status, headers: error.retryAfterS ? { "Retry-After": String(error.retryAfterS) } : undefined },
      );
    }
    throw error;
  }
}

export default function SignIn({ loaderData, actionData }: Route.ComponentProps) {
  const busy = useNavigation().state === "submitting";
  const errors = actionData?.errors ?? {};
  return (
    <div className="mx-auto max-w-md">
      <h1 className="text-2xl font-bold">Sign in</h1>
      <p className="mt-2 text-slate">Boaters follow their reports and alerts here; harbour staff reach the staff desk.</p>
      <Form method="post" className="card mt-6 space-y-4" noValidate>
        <FormError error={errors.form} />
        <input type="hidden" name="redirectTo" value={loaderData.redirectTo} />
        <Field label="E-mail address" name="email" type="email" autoComplete="email" required defaultValue={actionData?.values.email} error={errors.email} />
        <Field label="Password" name="password" type="password" autoComplete="current-password" required error={errors.password} />
        <button type="submit" className="btn-primary w-full" disabled={busy}>
          {busy ? "Signing in…" : "Sign in"}
        </button>
        <p className="flex justify-between text-sm">
          <Link to="/forgot-password">Forgotten your password?</Link>
          <Link to="/sign-up">Create an account</Link>
        </p>
      </Form>
    </div>
  );
}
