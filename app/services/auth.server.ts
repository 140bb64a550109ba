import { redirect, data, type RouterContextProvider } from "react-router";
import { Authenticator } from "remix-auth";
import { FormStrategy } from "remix-auth-form";
import { z } from "zod";
import { CLIENT_ADDRESS_HEADER, clientAddressContext } from "~/context";
import { env } from "~/env.server";
import { can, type Capability, type Role } from "~/lib/permissions";
import { checkLoginThrottle, clearAccountFailures, recordLoginFailure } from "~/models/login-throttle.server";
import { getUserById, normaliseEmail, verifyLogin, type User } from "~/models/user.server";
import { commitSession, getSession, sessionStorage } from "./session.server";

export const signInSchema = z.object({
  email: z.email("Enter a valid e-mail address").max(254),
  password: z.string().min(1, "Enter your password").max(200),
});

/** An expected sign-in failure, shown to the user beside the form. */
export class SignInError extends Error {
  constructor(
    message: string,
    readonly field: "email" | "password" | "form",
    readonly status = 400,
    readonly retryAfterS?: number,
  ) {
    super(message);
  }
}

export function clientAddress(request: Request, context?: Readonly<RouterContextProvider>): string | null {
  if (env().TRUST_PROXY) {
    const forwarded = request.headers.get("x-forwarded-for")?.split(",")[0]?.trim();
    if (forwarded) return forwarded;
  }
  let fromContext: string | null = null;
  try {
    fromContext = context?.get(clientAddressContext) ?? null;
  } catch {
    /* a context without the key */
  }
  // Only scripts/serve.ts sets this header, overwriting any copy sent by the client.
  return fromContext ?? (env().NODE_ENV === "production" ? request.headers.get(CLIENT_ADDRESS_HEADER) || null : null);
}

export const authenticator = new Authenticator<User>();

/** The password did not match: counted towards the sign-in throttle. */
class MismatchError extends SignInError {}

function parseSignIn(form: FormData) {
  const parsed = signInSchema.safeParse(Object.fromEntries(form));
  if (!parsed.success) {
    const issue = parsed.error.issues[0];
    throw new SignInError(issue.message, issue.path[0] === "password" ? "password" : "email");
  }
  return { email: normaliseEmail(parsed.data.email), password: parsed.data.password };
}

authenticator.use(
  new FormStrategy(async ({ form }) => {
    const { email, password } = parseSignIn(form);
    const user = await verifyLogin(email, password);
    if (!user) throw new MismatchError("That e-mail address and password do not match an account.", "form", 400);
    if (!user.emailVerifiedAt) {
      throw new SignInError("Confirm your e-mail address first: follow the link in the message we sent you.", "email", 400);
    }
    return user;
  }),
  "form",
);

/**
 * Signs in with the form strategy, throttled per account and per client address. The throttle
 * lives here rather than in the strategy because remix-auth hands the strategy a copy of the
 * request, without the router context that carries the address.
 */
export async function authenticateForm(request: Request, context?: Readonly<RouterContextProvider>): Promise<User> {
  const address = clientAddress(request, context);
  let form: FormData;
  try {
    form = await request.clone().formData();
  } catch {
    throw new SignInError("The form could not be read. Send it as a normal web form.", "form");
  }
  const { email } = parseSignIn(form);
  const throttle = await checkLoginThrottle(email, address);
  if (throttle.blocked) {
    const minutes = Math.ceil(throttle.retryAfterS / 60);
    throw new SignInError(
      `Too many failed sign-ins. Wait ${minutes} minute${minutes === 1 ? "" : "s"} and try again, or reset your password.`,
      "form",
      429,
      throttle.retryAfterS,
    );
  }
  try {
    const user = await authenticator.authenticate("form", request);
    await clearAccountFailures(email);
    return user;
  } catch (error) {
    if (error instanceof MismatchError) await recordLoginFailure(email, address);
    throw error;
  }
}

/**
 * Starts a fresh session for the user: the old session (and its id) is destroyed first, so an
 * id planted before sign-in is worthless afterwards (session fixation).
 */
export async function createUserSession(request: Request, user: User, redirectTo: string) {
  const storage = sessionStorage();
  const old = await getSession(request);
  const headers = new Headers();
  if (old.id) headers.append("Set-Cookie", await storage.destroySession(old));
  const session = await storage.getSession();
  session.set("userId", user.id);
  session.flash("toast", { kind: "success", message: `Signed in as ${user.name}.` });
  headers.append("Set-Cookie", await commitSession(session));
  return redirect(safeRedirect(redirectTo), { headers });
}

export async function destroyUserSession(request: Request) {
  const session = await getSession(request);
  const headers = new Headers();
  headers.append("Set-Cookie", await sessionStorage().destroySession(session));
  const fresh = await sessionStorage().getSession();
  fresh.flash("toast", { kind: "info", message: "You are signed out." });
  headers.append("Set-Cookie", await commitSession(fresh));
  return redirect("/", { headers });
}

/** Only same-site relative paths; anything else goes home. */
export function safeRedirect(to: FormDataEntryValue | string | null | undefined, fallback = "/"): string {
  if (typeof to !== "string" || !to.startsWith("/") || to.startsWith("//") || to.startsWith("/\\")) return fallback;
  return to;
}

const userCache = new WeakMap<Request, Promise<User | null>>();

export function getOptionalUser(request: Request): Promise<User | null> {
  let pending = userCache.get(request);
  if (!pending) {
    pending = (async () => {
      const session = await getSession(request);
      const userId = session.get("userId");
      if (!userId) return null;
      const user = await getUserById(userId);
      return user && !user.disabledAt ? user : null;
    })();
    userCache.set(request, pending);
  }
  return pending;
}

export async function requireUser(request: Request): Promise<User> {
  const user = await getOptionalUser(request);
  if (!user) {
    const url = new URL(request.url);
    // A client-side navigation asks for `/path.data` (or `/_root.data`): come back to the page.
    const pathname = url.pathname === "/_root.data" ? "/" : url.pathname.replace(/\.data$/, "");
    url.searchParams.delete("_routes");
    throw redirect(`/sign-in?redirectTo=${encodeURIComponent(pathname + (url.searchParams.size ? `?${url.searchParams}` : ""))}`);
  }
  return user;
}

export async function requireAnonymous(request: Request) {
  if (await getOptionalUser(request)) throw redirect("/account");
}

/** Signed in and holding one of the roles; otherwise 403 (or sign-in for anonymous users). */
export async function requireRole(request: Request, roles: readonly Role[]): Promise<User> {
  const user = await requireUser(request);
  if (!roles.includes(user.role)) throw data({ error: "You do not have permission to do that." }, { status: 403 });
  return user;
}

export async function requireCapability(request: Request, capability: Capability): Promise<User> {
  const user = await requireUser(request);
  if (!can(user.role, capability)) throw data({ error: "You do not have permission to do that." }, { status: 403 });
  return user;
}
