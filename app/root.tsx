import { isRouteErrorResponse, Link, Links, Meta, Outlet, Scripts, ScrollRestoration } from "react-router";
import type { Route } from "./+types/root";
import "./app.css";
import { NavBar, type NavUser } from "./components/NavBar";
import { getSession } from "./auth/guards.server";
import { roleSummary } from "./users/summary.server";
import { rootMiddleware } from "./security/middleware.server";

/** Security headers, CSP nonce and the same-origin check for mutations (app/security). */
export const middleware: Route.MiddlewareFunction[] = rootMiddleware;

export const links: Route.LinksFunction = () => [{ rel: "icon", href: "/favicon.svg", type: "image/svg+xml" }];

export async function loader({ context }: Route.LoaderArgs) {
  const session = getSession(context);
  if (!session) return { user: null };
  const roles = await roleSummary(session.user);
  const user: NavUser = {
    name: session.user.name,
    email: session.user.email,
    isAdmin: roles.isAdmin,
    organizes: roles.organizerOf.length > 0,
    judges: roles.judgeOf.length > 0,
    inCrew: roles.crews.length > 0,
  };
  return { user };
}

export function Layout({ children }: { children: React.ReactNode }) {
  return (
    <html lang="en">
      <head>
        <meta charSet="utf-8" />
        <meta name="viewport" content="width=device-width, initial-scale=1" />
        <Meta />
        <Links />
      </head>
      <body className="min-h-screen">
        <a href="#main" className="sr-only focus:not-sr-only focus:absolute focus:left-2 focus:top-2 focus:z-50 focus:rounded focus:bg-card focus:p-2">
          Skip to content
        </a>
        {children}
        <ScrollRestoration />
        <Scripts />
      </body>
    </html>
  );
}

export default function App({ loaderData }: Route.ComponentProps) {
  return (
    <>
      <NavBar user={loaderData.user} />
      <main id="main" className="mx-auto max-w-6xl px-4 py-8">
        <Outlet />
      </main>
      <footer className="mx-auto max-w-6xl px-4 pb-10 text-xs text-mute">
        Gatecrash — entries, conformance and judging for tiny-silicon demo compos. A passing check is not the foundry's
        signoff.
      </footer>
    </>
  );
}

export function ErrorBoundary({ error }: Route.ErrorBoundaryProps) {
  let title = "Something went wrong";
  let detail = "Gatecrash hit an unexpected error. Nothing you entered was lost; try again in a moment.";
  let status = 500;
  if (isRouteErrorResponse(error)) {
    status = error.status;
    if (error.status === 404) {
      title = "Nothing here";
      detail = "This page does not exist, or it is not public.";
    } else if (error.status === 403) {
      title = "Not for you";
      detail = (error.data as { message?: string })?.message ?? "You do not have access to this page.";
    } else if (error.status === 503) {
      title = "Gatecrash is catching its breath";
      detail = (error.data as { message?: string })?.message ?? "The database is not answering right now. Your work is safe; this page will work again shortly.";
    } else {
      detail = (error.data as { message?: string })?.message ?? error.statusText;
    }
  } else if (import.meta.env.DEV && error instanceof Error) {
    detail = error.message;
  }
  return (
    <main id="main" className="mx-auto max-w-xl px-4 py-20 text-center">
      <p className="kicker">Error {status}</p>
      <h1 className="mt-2 text-display font-extrabold">{title}</h1>
      <p className="mt-4 text-ink-soft">{detail}</p>
      <Link to="/" className="btn-primary mt-8">
        Back to the start
      </Link>
    </main>
  );
}
