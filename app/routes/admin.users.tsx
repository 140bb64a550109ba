import { Form, useNavigation } from "react-router";
import { z } from "zod";
import type { Route } from "./+types/admin.users";
import { Field, FormError, Select } from "~/components/forms";
import { db } from "~/db.server";
import { email, personName } from "~/lib/account-schemas";
import { ROLE_LABELS, ROLES } from "~/lib/permissions";
import { issueToken } from "~/models/token.server";
import { createUser, getUserByEmail, getUserById, listUsers, setRole } from "~/models/user.server";
import { queueInviteMail } from "~/services/account-mail.server";
import { requireCapability } from "~/services/auth.server";
import { badRequest, parseFormWith, readForm } from "~/services/form.server";
import { redirectWithToast, revokeUserSessions } from "~/services/session.server";

export const meta: Route.MetaFunction = () => [{ title: "Users and roles · Tidewire" }];

const roleOptions = ROLES.map((r) => ({ value: r, label: ROLE_LABELS[r] }));

const inviteSchema = z.object({
  intent: z.literal("invite"),
  name: personName,
  email,
  role: z.enum(["officer", "harbourmaster", "admin"], { message: "Choose a staff role" }),
});
const roleSchema = z.object({
  intent: z.literal("set-role"),
  userId: z.coerce.number().int().positive("Choose a user"),
  role: z.enum(ROLES, { message: "Choose a role" }),
});

export async function loader({ request }: Route.LoaderArgs) {
  await requireCapability(request, "user:admin");
  const users = await listUsers();
  return { users: users.map((u) => ({ id: u.id, name: u.name, email: u.email, role: u.role, verified: !!u.emailVerifiedAt })) };
}

export async function action({ request }: Route.ActionArgs) {
  const admin = await requireCapability(request, "user:admin");
  const form = await readForm(request);
  const intent = form.get("intent");
  if (intent === "invite") {
    const parsed = parseFormWith(inviteSchema, form);
    if (!parsed.ok) return badRequest({ ...parsed.failure, values: { ...parsed.failure.values, intent: "invite" } });
    if (await getUserByEmail(parsed.data.email)) {
      return badRequest({ errors: { email: "This address already has an account; change its role in the table below." }, values: { ...parsed.data } });
    }
    await db.transaction(async (trx) => {
      const user = await createUser({ email: parsed.data.email, name: parsed.data.name, role: parsed.data.role }, trx);
      const token = await issueToken(user.id, "invite", trx);
      await queueInviteMail(user, ROLE_LABELS[parsed.data.role], token, trx);
    });
    return redirectWithToast(request, "/admin/users", { kind: "success", message: `Invitation sent to ${parsed.data.email}.` });
  }
  if (intent === "set-role") {
    const parsed = parseFormWith(roleSchema, form);
    if (!parsed.ok) return badRequest(parsed.failure);
    const target = await getUserById(parsed.data.userId);
    if (!target) return badRequest({ errors: { userId: "That user no longer exists." }, values: {} });
    if (target.id === admin.id && parsed.data.role !== "admin") {
      return badRequest({ errors: { userId: "You cannot remove your own administrator role." }, values: {} });
    }
    await db.transaction(async (trx) => {
      await setRole(target.id, parsed.data.role, trx);
      // A changed role takes effect at the next sign-in, not in a stale session.
      if (target.id !== admin.id) await revokeUserSessions(target.id, trx);
    });
    return redirectWithToast(request, "/admin/users", { kind: "success", message: `${target.name} is now ${ROLE_LABELS[parsed.data.role]}.` });
  }
  return badRequest({ errors: { form: "Unknown action." }, values: {} });
}

export default function AdminUsers({ loaderData, actionData }: Route.ComponentProps) {
  const busy = useNavigation().state === "submitting";
  const errors = actionData?.errors ?? {};
  const values = actionData?.values ?? {};
  return (
    <div className="space-y-8">
      <h1 className="text-2xl font-bold">Users and roles</h1>
      <section aria-labelledby="invite-heading" className="card max-w-2xl">
        <h2 id="invite-heading" className="text-lg font-bold">
          Invite a member of staff
        </h2>
        <Form method="post" className="mt-4 grid gap-4 sm:grid-cols-2" noValidate>
          <input type="hidden" name="intent" value="invite" />
          <Field label="Name" name="name" required defaultValue={values.name} error={errors.name} />
          <Field label="E-mail address" name="email" type="email" required defaultValue={values.email} error={errors.email} />
          <Select label="Role" name="role" defaultValue={values.role ?? "officer"} error={errors.role} options={roleOptions.filter((o) => o.value !== "boater")} />
          <div className="flex items-end">
            <button type="submit" className="btn-primary" disabled={busy}>
              Send invitation
            </button>
          </div>
        </Form>
      </section>
      <section aria-labelledby="users-heading">
        <h2 id="users-heading" className="text-lg font-bold">
          Everyone with an account
        </h2>
        <FormError error={errors.userId ?? errors.role ?? errors.form} />
        <div className="mt-3 overflow-x-auto">
          <table className="w-full border-collapse bg-white text-sm">
            <thead>
              <tr className="border-b border-mist text-left">
                <th scope="col" className="p-2">Name</th>
                <th scope="col" className="p-2">E-mail</th>
                <th scope="col" className="p-2">Confirmed</th>
                <th scope="col" className="p-2">Role</th>
              </tr>
            </thead>
            <tbody>
              {loaderData.users.map((u) => (
                <tr key={u.id} className="border-b border-mist">
                  <td className="p-2">{u.name}</td>
                  <td className="p-2">{u.email}</td>
                  <td className="p-2">{u.verified ? "yes" : "not yet"}</td>
                  <td className="p-2">
                    <Form method="post" className="flex items-center gap-2">
                      <input type="hidden" name="intent" value="set-role" />
                      <input type="hidden" name="userId" value={u.id} />
                      <label className="sr-only" htmlFor={`role-${u.id}`}>
                        Role of {u.name}
                      </label>
                      <select id={`role-${u.id}`} name="role" defaultValue={u.role} className="field-input py-1">
                        {roleOptions.map((o) => (
                          <option key={o.value} value={o.value}>
                            {o.label}
                          </option>
                        ))}
                      </select>
                      <button type="submit" className="btn-secondary py-1">
                        Save
                      </button>
                    </Form>
                  </td>
                </tr>
              ))}
            </tbody>
          </table>
        </div>
      </section>
    </div>
  );
}
