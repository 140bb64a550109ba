import { data, isRouteErrorResponse, Link, Links, Meta, Outlet, Scripts, ScrollRestoration, useRouteLoaderData } from "react-router";
import type { Route } from "./+types/root";
// The stylesheet goes inline into every page's head: the first paint then waits for the document
// only, not for a second request (6 kB compressed; style-src allows inline styles).
import appCss from "./app.css?inline";
import publicSans400 from "@fontsource/public-sans/files/public-sans-latin-400-normal.woff2?url";
import publicSans600 from "@fontsource/public-sans/files/public-sans-latin-600-normal.woff2?url";
import publicSans700 from "@fontsource/public-sans/files/public-sans-latin-700-normal.woff2?url";
import { useNonce } from "./components/nonce";
import { SiteHeader } from "./components/SiteHeader";
import { Toast } from "./components/Toast";
import { securityMiddleware } from "./services/security.server";
import { getOptionalUser } from "./services/auth.server";
import { commitSession, getSession } from "./services/session.server";

export const middleware: Route.MiddlewareFunction[] = [securityMiddleware];

// The three Latin faces every page uses (app.css imports them): preloaded from the document's
// head, so they arrive with the stylesheet instead of after it and the first paint is already set
// in Public Sans. Same files as the stylesheet's url()s, so the build gives them the same names.
const FONT_PRELOADS = [publicSans400, publicSans600, publicSans700].map((href) => ({ rel: "preload", as: "font", type: "font/woff2", href, crossOrigin: "anonymous" as const }));

export const links: Route.LinksFunction = () => [...FONT_PRELOADS, { rel: "icon", href: "/favicon.svg", type: "image/svg+xml" }];

export async function loader({ request }: Route.LoaderArgs) {
  // Only touch the session store when the browser sent a cookie: most public reads have none.
  if (!request.headers.get("Cookie")?.includes("tw_session=")) return { user: null, toast: null };
  const [user, session] = await Promise.all([getOptionalUser(request), getSession(request)]);
  const toast = session.get("toast") ?? null;
  const headers = toast ? { "Set-Cookie": await commitSession(session) } : undefined;
  return data({ user: user ? { id: user.id, name: user.name, role: user.role } : null, toast }, { headers });
}

export function Layout({ children }: { children: React.ReactNode }) {
  const nonce = useNonce();
  const rootData = useRouteLoaderData<typeof loader>("root");
  return (
    <html lang="en-GB">
      <head>
        <meta charSet="utf-8" />
        <meta name="viewport" content="width=device-width, initial-scale=1" />
        <meta name="description" content="Local navigational warnings, aid-to-navigation reports and alerts for Kestrel Sound." />
        <Meta />
        <style dangerouslySetInnerHTML={{ __html: appCss }} />
        <Links />
      </head>
      <body className="flex min-h-screen flex-col">
        <SiteHeader user={rootData?.user ?? null} />
        <Toast toast={rootData?.toast ?? null} />
        <main id="main" className="mx-auto w-full max-w-7xl flex-1 px-4 py-6">
          {children}
        </main>
        <footer className="no-print border-t border-mist bg-white">
          <div className="mx-auto max-w-7xl px-4 py-4 text-xs text-slate">
            Tidewire · Kestrel Sound Harbour Authority (a fictional demonstration harbour). Tidewire informs; it does not replace
            official charts, official notices to mariners, local regulations or a proper lookout.{" "}
            <Link to="/feeds">Feeds and API</Link>
          </div>
        </footer>
        <ScrollRestoration nonce={nonce} />
        <Scripts nonce={nonce} />
      </body>
    </html>
  );
}

export default function App() {
  return <Outlet />;
}

export function meta() {
  return [{ title: "Tidewire · Kestrel Sound" }];
}

export function ErrorBoundary({ error }: Route.ErrorBoundaryProps) {
  let status = 500;
  let title = "Something went wrong";
  let message = "An unexpected error occurred. The team has been told; please try again.";
  if (isRouteErrorResponse(error)) {
    status = error.status;
    const detail = typeof error.data === "object" && error.data && "error" in error.data ? String(error.data.error) : typeof error.data === "string" ? error.data : "";
    if (status === 404) {
      title = "Page not found";
      message = detail && detail !== "Not found" ? detail : "There is no page at this address. It may have moved, or the link may be mistyped.";
    } else if (status === 403) {
      title = "Not allowed";
      message = detail || "Your account does not have permission for this page.";
    } else if (status === 503) {
      title = "Temporarily unavailable";
      message = "The notice service cannot reach its database just now. Please try again in a minute. For urgent safety information, contact the harbour office on VHF.";
    } else if (status < 500) {
      title = "That did not work";
      message = detail || error.statusText;
    }
  } else if (import.meta.env.DEV && error instanceof Error) {
    message = error.message;
  }
  return (
    <div className="mx-auto max-w-2xl py-12">
      <p className="text-sm font-bold tracking-widest text-deep uppercase">Error {status}</p>
      <h1 className="mt-2 text-3xl font-bold">{title}</h1>
      <p className="mt-4 text-lg">{message}</p>
      <p className="mt-6">
        <Link to="/" className="btn-primary">
          Back to the notice board
        </Link>
      </p>
    </div>
  );
}
