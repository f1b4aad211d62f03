import { createContext, data, redirect, type MiddlewareFunction, type RouterContextProvider } from "react-router";
import { auth, type AuthSession } from "./auth.server";

/**
 * Who is asking. The root middleware reads the session once per request (`readSessionOnce`) into the router
 * context; every guard and loader reads it from there (`getSession(context)`), never from better-auth again.
 * Pages get a redirect to sign-in when anonymous; a signed-in caller without the role gets 404 wherever the URL
 * names an object (the answer never confirms that it exists: app/competitions/access.server.ts), and 403 only on
 * pages that name none (the organizer's and judge's home pages, /admin). JSON routes use ~/api/json.server.
 */
export type SessionUser = AuthSession["user"];
export type EventRole = "organizer" | "judge";
export type RequestContext = Readonly<RouterContextProvider>;

/** No default: a loader run without the root middleware fails loudly instead of seeing everyone as anonymous. */
export const sessionContext = createContext<AuthSession | null>();

export const readSessionOnce: MiddlewareFunction<Response> = async ({ request, context }, next) => {
  context.set(sessionContext, await auth().api.getSession({ headers: request.headers }));
  return next();
};

export function getSession(context: RequestContext): AuthSession | null {
  return context.get(sessionContext);
}

export function isAdmin(user: Pick<SessionUser, "role">): boolean {
  return user.role === "admin";
}

function signInRedirect(request: Request): never {
  const url = new URL(request.url);
  throw redirect(`/sign-in?next=${encodeURIComponent(url.pathname + url.search)}`);
}

export function forbidden(message = "You do not have access to this page."): never {
  throw data({ message }, { status: 403 });
}

export function notFound(message = "This page does not exist, or it is not yours to see."): never {
  throw data({ message }, { status: 404 });
}

export async function requireUser(request: Request, context: RequestContext): Promise<SessionUser> {
  const s = getSession(context);
  if (!s) signInRedirect(request);
  return s.user;
}

export async function requireAdmin(request: Request, context: RequestContext): Promise<SessionUser> {
  const user = await requireUser(request, context);
  if (!isAdmin(user)) forbidden();
  return user;
}

