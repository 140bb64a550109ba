import { redirect } from "react-router";
import type { Route } from "./+types/sign-out";
import { destroyUserSession } from "~/services/auth.server";

// Signing out changes state, so it is an action; a GET only goes home.
export function loader() {
  return redirect("/");
}

export async function action({ request }: Route.ActionArgs) {
  return destroyUserSession(request);
}
