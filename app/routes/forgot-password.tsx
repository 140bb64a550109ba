import { Form, useNavigation } from "react-router";
import type { Route } from "./+types/forgot-password";
import { Field } from "~/components/forms";
import { db } from "~/db.server";
import { forgotSchema } from "~/lib/account-schemas";
import { issueToken } from "~/models/token.server";
import { getUserByEmail } from "~/models/user.server";
import { queuePasswordResetMail } from "~/services/account-mail.server";
import { requireAnonymous } from "~/services/auth.server";
import { badRequest, parseFormWith, readForm } from "~/services/form.server";
import { redirectWithToast } from "~/services/session.server";

export const meta: Route.MetaFunction = () => [{ title: "Reset your password · Tidewire" }];

export async function loader({ request }: Route.LoaderArgs) {
  await requireAnonymous(request);
  return null;
}

export async function action({ request }: Route.ActionArgs) {
  await requireAnonymous(request);
  const parsed = parseFormWith(forgotSchema, await readForm(request));
  if (!parsed.ok) return badRequest(parsed.failure);
  const user = await getUserByEmail(parsed.data.email);
  if (user && !user.disabledAt) {
    await db.transaction(async (trx) => {
      const token = await issueToken(user.id, "reset_password", trx);
      await queuePasswordResetMail(user, token, trx);
    });
  }
  // The same answer for known and unknown addresses.
  return redirectWithToast(request, "/sign-in", {
    kind: "info",
    message: "If that address has an account, a reset link is on its way. It works once, for one hour.",
  });
}

export default function ForgotPassword({ actionData }: Route.ComponentProps) {
  const busy = useNavigation().state === "submitting";
  return (
    <div className="mx-auto max-w-md">
      <h1 className="text-2xl font-bold">Reset your password</h1>
      <Form method="post" className="card mt-6 space-y-4" noValidate>
        <Field label="E-mail address" name="email" type="email" autoComplete="email" required defaultValue={actionData?.values.email} error={actionData?.errors.email} />
        <button type="submit" className="btn-primary w-full" disabled={busy}>
          Send a reset link
        </button>
      </Form>
    </div>
  );
}
