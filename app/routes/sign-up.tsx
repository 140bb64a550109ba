import { Form, Link, useNavigation } from "react-router";
import type { Route } from "./+types/sign-up";
import { Field, FormError } from "~/components/forms";
import { db } from "~/db.server";
import { signUpSchema } from "~/lib/account-schemas";
import { issueToken } from "~/models/token.server";
import { createUser, getUserByEmail } from "~/models/user.server";
import { queueVerificationMail } from "~/services/account-mail.server";
import { requireAnonymous } from "~/services/auth.server";
import { badRequest, parseFormWith, readForm } from "~/services/form.server";
import { redirectWithToast } from "~/services/session.server";

export const meta: Route.MetaFunction = () => [{ title: "Create an account · Tidewire" }];

export async function loader({ request }: Route.LoaderArgs) {
  await requireAnonymous(request);
  return null;
}

export async function action({ request }: Route.ActionArgs) {
  await requireAnonymous(request);
  const form = await readForm(request);
  const parsed = parseFormWith(signUpSchema, form);
  if (!parsed.ok) return badRequest(parsed.failure);
  const { name, email, password } = parsed.data;
  const existing = await getUserByEmail(email);
  if (!existing) {
    // The account, its verification token and the e-mail in the outbox commit together.
    await db.transaction(async (trx) => {
      const user = await createUser({ email, name, password, role: "boater" }, trx);
      const token = await issueToken(user.id, "verify_email", trx);
      await queueVerificationMail(user, token, trx);
    });
  }
  // Same answer whether or not the address already had an account: sign-up reveals nothing.
  return redirectWithToast(request, "/sign-up?sent=1", {
    kind: "info",
    message: `We sent a confirmation link to ${email}. Follow it to finish creating your account.`,
  });
}

export default function SignUp({ actionData }: Route.ComponentProps) {
  const busy = useNavigation().state === "submitting";
  const errors = actionData?.errors ?? {};
  const values = actionData?.values ?? {};
  return (
    <div className="mx-auto max-w-md">
      <h1 className="text-2xl font-bold">Create a boater account</h1>
      <p className="mt-2 text-slate">
        An account lets you follow your discrepancy reports and manage your alerts. You can also report and subscribe
        without one.
      </p>
      <Form method="post" className="card mt-6 space-y-4" noValidate>
        <FormError error={errors.form} />
        <Field label="Your name" name="name" autoComplete="name" required defaultValue={values.name} error={errors.name} />
        <Field label="E-mail address" name="email" type="email" autoComplete="email" required defaultValue={values.email} error={errors.email} />
        <Field label="Password" name="password" type="password" autoComplete="new-password" required hint="At least 10 characters. A passphrase is good." error={errors.password} />
        <Field label="Repeat the password" name="confirmPassword" type="password" autoComplete="new-password" required error={errors.confirmPassword} />
        <button type="submit" className="btn-primary w-full" disabled={busy}>
          {busy ? "Creating…" : "Create account"}
        </button>
        <p className="text-sm">
          Already registered? <Link to="/sign-in">Sign in</Link>
        </p>
      </Form>
    </div>
  );
}
