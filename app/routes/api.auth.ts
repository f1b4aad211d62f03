import { apiError } from "~/api/json.server";
import { CLIENT_ADDRESS_HEADER, auth } from "~/auth/auth.server";
import { clientAddress } from "~/auth/forward.server";
import type { RequestContext } from "~/auth/guards.server";
import type { Route } from "./+types/api.auth";

/**
 * better-auth's own endpoints (verification and reset links, session). The client address it rate-limits by is
 * the one the production server determined, never a header the caller wrote. Password sign-in goes through the
 * sign-in page, whose per-account limit (app/auth/sign-in-limit.server.ts) a direct call would otherwise skip.
 */
function withClientAddress(request: Request, context: RequestContext): Request {
  const headers = new Headers(request.headers);
  headers.delete("x-forwarded-for");
  headers.set(CLIENT_ADDRESS_HEADER, clientAddress(context));
  return new Request(request, { headers });
}

export async function loader({ request, context }: Route.LoaderArgs) {
  return auth().handler(withClientAddress(request, context));
}

export async function action({ request, context }: Route.ActionArgs) {
  if (new URL(request.url).pathname.startsWith("/api/auth/sign-in/")) throw apiError(404, "not_found", "Sign in on the /sign-in page.");
  return auth().handler(withClientAddress(request, context));
}
