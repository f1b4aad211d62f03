import { env } from "~/env.server";
import { auth } from "./auth.server";

/**
 * Page actions (sign-in, sign-up, reset…) go through better-auth's own HTTP handler rather than its server API,
 * so its rate limiting, origin checks and cookie handling apply exactly as for a direct API call.
 */
export interface AuthCall {
  status: number;
  body: { code?: string; message?: string; [k: string]: unknown } | null;
  setCookies: string[];
}

export async function callAuth(request: Request, path: string, body: unknown): Promise<AuthCall> {
  const headers = new Headers({ "content-type": "application/json", origin: env().APP_URL });
  for (const h of ["cookie", "user-agent", "x-forwarded-for"]) {
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
