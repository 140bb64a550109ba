import { Form, Link } from "react-router";
import type { Route } from "./+types/accept-invite";
import { Field, FormError } from "~/components/forms";
import { db } from "~/db.server";
import { resetSchema } from "~/lib/account-schemas";
import { consumeToken, peekToken } from "~/models/token.server";
import { markEmailVerified, setPassword } from "~/models/user.server";
import { badRequest, parseFormWith, readForm } from "~/services/form.server";
import { redirectWithToast } from "~/services/session.server";

export const meta: Route.MetaFunction = () => [{ title: "Accept your invitation · Tidewire" }];

export async function loader({ request }: Route.LoaderArgs) {
  const token = new URL(request.url).searchParams.get("token") ?? "";
  const valid = token.length >= 10 && token.length <= 200 && (await peekToken(token, "invite")) !== null;
  return { token: valid ? token : null };
}

export async function action({ request }: Route.ActionArgs) {
  const parsed = parseFormWith(resetSchema, await readForm(request));
  if (!parsed.ok) return badRequest(parsed.failure);
  const done = await db.transaction(async (trx) => {
    const userId = await consumeToken(parsed.data.token, "invite", trx);
    if (!userId) return false;
    await setPassword(userId, parsed.data.password, trx);
    await markEmailVerified(userId, trx);
    return true;
  });
  if (!done) return badRequest({ errors: { form: "This invitation is invalid, already used or expired. Ask the administrator for a new one." }, values: {} });
  return redirectWithToast(request, "/sign-in", { kind: "success", message: "Your staff account is ready. Sign in with your new password." });
}

export default function AcceptInvite({ loaderData, actionData }: Route.ComponentProps) {
  if (!loaderData.token) {
    return (
      <div className="mx-auto max-w-md">
        <h1 className="text-2xl font-bold">This invitation does not work</h1>
        <p className="mt-4">It is invalid, already used or expired (invitations last 48 hours).</p>
        <p className="mt-4">
          <Link to="/">Back to the notice board</Link>
        </p>
      </div>
    );
  }
  const errors = actionData?.errors ?? {};
  return (
    <div className="mx-auto max-w-md">
      <h1 className="text-2xl font-bold">Set your password</h1>
      <Form method="post" className="card mt-6 space-y-4" noValidate>
        <FormError error={errors.form} />
        <input type="hidden" name="token" value={loaderData.token} />
        <Field label="Password" name="password" type="password" autoComplete="new-password" required hint="At least 10 characters." error={errors.password} />
        <Field label="Repeat the password" name="confirmPassword" type="password" autoComplete="new-password" required error={errors.confirmPassword} />
        <button type="submit" className="btn-primary w-full">
          Activate account
        </button>
      </Form>
    </div>
  );
}
