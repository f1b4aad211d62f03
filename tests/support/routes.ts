import { RouterContextProvider } from "react-router";
import { readSessionOnce } from "~/auth/guards.server";

/**
 * The router context a loader or action gets from the root middleware: here the session step of it
 * (app/auth/guards.server.ts readSessionOnce), run on the request, so guards read the caller as in production.
 */
export async function routeContext(request: Request): Promise<RouterContextProvider> {
  const context = new RouterContextProvider();
  await readSessionOnce({ request, context, params: {}, unstable_pattern: "" } as never, async () => new Response());
  return context;
}

/** A loader's or action's arguments for `request`, with the router context the root middleware would give it. */
export async function routeArgs(request: Request, params: Record<string, string | undefined> = {}) {
  return { request, params, context: await routeContext(request) };
}

/**
 * Calls a route module's loader or action the way React Router does, and reports the outcome as a status:
 * a returned value is 200, a thrown redirect is its 3xx with a location, a thrown data(…, {status}) its status.
 */
export interface Outcome<T> {
  status: number;
  location?: string;
  data?: T;
}

type RouteFn<T> = (args: { request: Request; params: Record<string, string | undefined>; context: unknown }) => Promise<T>;

export async function callRoute<T>(fn: unknown, request: Request, params: Record<string, string> = {}): Promise<Outcome<T>> {
  try {
    const value = await (fn as RouteFn<T>)({ request, params, context: await routeContext(request) });
    if (value instanceof Response) return { status: value.status, location: value.headers.get("location") ?? undefined };
    const returned = value as { type?: string; init?: { status?: number }; data?: T };
    if (returned?.type === "DataWithResponseInit") return { status: returned.init?.status ?? 200, data: returned.data };
    return { status: 200, data: value };
  } catch (thrown) {
    if (thrown instanceof Response) return { status: thrown.status, location: thrown.headers.get("location") ?? undefined };
    const t = thrown as { type?: string; init?: { status?: number }; data?: T };
    if (t?.type === "DataWithResponseInit") return { status: t.init?.status ?? 200, data: t.data };
    throw thrown;
  }
}
