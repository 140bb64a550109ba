import { Form, Link } from "react-router";
import type { Route } from "./+types/reset-password";
import { Field, FormError } from "~/components/forms";
import { db } from "~/db.server";
import { resetSchema } from "~/lib/account-schemas";
import { consumeToken, peekToken } from "~/models/token.server";
import { markEmailVerified, setPassword } from "~/models/user.server";
import { badRequest, parseFormWith, readForm } from "~/services/form.server";
import { redirectWithToast, revokeUserSessions } from "~/services/session.server";

export const meta: Route.MetaFunction = () => [{ title: "Choose a new password · Tidewire" }];

export async function loader({ request }: Route.LoaderArgs) {
  const token = new URL(request.url).searchParams.get("token") ?? "";
  const valid = token.length >= 10 && token.length <= 200 && (await peekToken(token, "reset_password")) !== null;
  return { token: valid ? token : null };
}

export async function action({ request }: Route.ActionArgs) {
  const form = await readForm(request);
  const parsed = parseFormWith(resetSchema, form);
  if (!parsed.ok) return badRequest(parsed.failure);
  const done = await db.transaction(async (trx) => {
    const userId = await consumeToken(parsed.data.token, "reset_password", trx);
    if (!userId) return false;
    await setPassword(userId, parsed.data.password, trx);
    // Whoever could reach the inbox could reset; verifying is implied, and old sessions go.
    await markEmailVerified(userId, trx);
    await revokeUserSessions(userId, trx);
    return true;
  });
  if (!done) return badRequest({ errors: { form: "This reset link is invalid, already used or expired. Ask for a new one." }, values: {} });
  return redirectWithToast(request, "/sign-in", { kind: "success", message: "Your password is changed. Sign in with the new one." });
}

export default function ResetPassword({ loaderData, actionData }: Route.ComponentProps) {
  if (!loaderData.token) {
    return (
      <div className="mx-auto max-w-md">
        <h1 className="text-2xl font-bold">This link does not work</h1>
        <p className="mt-4">The reset link is invalid, already used or expired (links last one hour).</p>
        <p className="mt-4">
          <Link to="/forgot-password" className="btn-primary">
            Ask for a new link
          </Link>
        </p>
      </div>
    );
  }
  const errors = actionData?.errors ?? {};
  return (
    <div className="mx-auto max-w-md">
      <h1 className="text-2xl font-bold">Choose a new password</h1>
      <Form method="post" className="card mt-6 space-y-4" noValidate>
        <FormError error={errors.form ?? errors.token} />
        <input type="hidden" name="token" value={loaderData.token} />
        <Field label="New password" name="password" type="password" autoComplete="new-password" required hint="At least 10 characters." error={errors.password} />
        <Field label="Repeat the new password" name="confirmPassword" type="password" autoComplete="new-password" required error={errors.confirmPassword} />
        <button type="submit" className="btn-primary w-full">
          Change password
        </button>
      </Form>
    </div>
  );
}
