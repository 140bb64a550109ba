import { Link } from "react-router";
import type { Route } from "./+types/verify-email";
import { consumeToken } from "~/models/token.server";
import { markEmailVerified } from "~/models/user.server";
import { redirectWithToast } from "~/services/session.server";

export const meta: Route.MetaFunction = () => [{ title: "Confirm e-mail · Tidewire" }];

export async function loader({ request }: Route.LoaderArgs) {
  const token = new URL(request.url).searchParams.get("token") ?? "";
  if (token.length < 10 || token.length > 200) return { ok: false as const };
  const userId = await consumeToken(token, "verify_email");
  if (!userId) return { ok: false as const };
  await markEmailVerified(userId);
  throw await redirectWithToast(request, "/sign-in", { kind: "success", message: "Your e-mail address is confirmed. You can sign in now." });
}

export default function VerifyEmail() {
  return (
    <div className="mx-auto max-w-md">
      <h1 className="text-2xl font-bold">This link does not work</h1>
      <p className="mt-4">The confirmation link is invalid, already used or expired (links last 48 hours).</p>
      <p className="mt-4">
        <Link to="/sign-up" className="btn-primary">
          Sign up again
        </Link>
      </p>
    </div>
  );
}
