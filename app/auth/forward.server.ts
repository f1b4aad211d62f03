import { env } from "~/env.server";
import { clientAddressContext } from "~/security/context";
import { auth, CLIENT_ADDRESS_HEADER } from "./auth.server";
import type { RequestContext } from "./guards.server";

/**
 * Page actions (sign-in, sign-up, reset…) go through better-auth's own HTTP handler rather than its server API,
 * so its rate limiting, origin checks and cookie handling apply exactly as for a direct API call. The client
 * address better-auth limits by is the one the production server determined (CLIENT_ADDRESS_HEADER), never an
 * X-Forwarded-For the caller wrote.
 */
/** The client's address for rate limits: from the production server, or one shared "unknown" where none runs. */
export function clientAddress(context: RequestContext): string {
  return context.get(clientAddressContext) ?? "unknown";
}
export interface AuthCall {
  status: number;
  body: { code?: string; message?: string; [k: string]: unknown } | null;
  setCookies: string[];
}

export async function callAuth(request: Request, context: RequestContext, path: string, body: unknown): Promise<AuthCall> {
  const headers = new Headers({ "content-type": "application/json", origin: env().APP_URL, [CLIENT_ADDRESS_HEADER]: clientAddress(context) });
  for (const h of ["cookie", "user-agent"]) {
    const v = request.headers.get(h);
    if (v) headers.set(h, v);
  }
  const res = await auth().handler(
    new Request(new URL(`/api/auth${path}`, env().APP_URL), { method: "POST", headers, body: JSON.stringify(body) }),
  );
  const text = await res.text();
  return {
    status: res.status,
    body: text ? (JSON.parse(text) as AuthCall["body"]) : null,
    setCookies: res.headers.getSetCookie(),
  };
}

export function cookieHeaders(call: AuthCall): Headers {
  const h = new Headers();
  for (const c of call.setCookies) h.append("Set-Cookie", c);
  return h;
}
