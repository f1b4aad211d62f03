import type { z } from "zod";
import { getSession, type RequestContext, type SessionUser } from "~/auth/guards.server";
import { readJsonText } from "./body.server";

/**
 * The JSON API convention for every /api/* resource route: session-cookie auth through the same helpers as
 * pages, zod-validated bodies, and one error shape:
 *   { error: { status, code, message, fieldErrors? } }
 * Helpers throw a Response, which React Router returns as is from a resource route.
 */
export interface ApiErrorBody {
  error: { status: number; code: string; message: string; fieldErrors?: Record<string, string[]> };
}

export function apiError(status: number, code: string, message: string, fieldErrors?: Record<string, string[]>): Response {
  const body: ApiErrorBody = { error: { status, code, message, ...(fieldErrors ? { fieldErrors } : {}) } };
  return Response.json(body, { status, headers: { "Cache-Control": "no-store" } });
}

export function apiJson(body: unknown, init: ResponseInit = {}): Response {
  const headers = new Headers(init.headers);
  headers.set("Cache-Control", "no-store");
  return Response.json(body, { ...init, headers });
}

export async function requireApiUser(context: RequestContext): Promise<SessionUser> {
  const s = getSession(context);
  if (!s) throw apiError(401, "unauthenticated", "Sign in first.");
  return s.user;
}

export function apiNotFound(what = "That"): never {
  throw apiError(404, "not_found", `${what} was not found.`);
}

/**
 * Parses and validates a JSON body; a wrong body is a 400 with field errors, never a 500. The body is read within
 * the route's limit (app/security/body-limits.ts) while it streams: an oversized one is a 413 before it is held whole.
 */
export async function parseJsonBody<S extends z.ZodType>(request: Request, schema: S, maxBytes?: number): Promise<z.infer<S>> {
  const type = request.headers.get("content-type") ?? "";
  if (!type.includes("application/json")) throw apiError(415, "unsupported_media_type", "Send the body as application/json.");
  const text = await readJsonText(request, maxBytes);
  let raw: unknown;
  try {
    raw = JSON.parse(text);
  } catch {
    throw apiError(400, "invalid_json", "The body is not valid JSON.");
  }
  const parsed = schema.safeParse(raw);
  if (!parsed.success) {
    const fieldErrors: Record<string, string[]> = {};
    for (const issue of parsed.error.issues) {
      const key = issue.path.join(".") || "_";
      (fieldErrors[key] ??= []).push(issue.message);
    }
    throw apiError(400, "invalid_body", "Some fields are not valid.", fieldErrors);
  }
  return parsed.data;
}

export function requireMethod(request: Request, methods: string[]): void {
  if (!methods.includes(request.method)) throw apiError(405, "method_not_allowed", `Use ${methods.join(" or ")}.`);
}
