import { auth } from "~/auth/auth.server";
import { db } from "~/db/client.server";
import { account, eventRoles, events, user } from "~/db/schema";

/**
 * Test fixtures that create their own data and sign in directly (no UI round trip):
 * every test gets fresh accounts with unique addresses, so tests never depend on each other or on the demo.
 */
export const TEST_PASSWORD = "correct-horse-battery";

let counter = 0;
export function unique(prefix: string): string {
  counter += 1;
  return `${prefix}-${process.pid}-${Date.now().toString(36)}-${counter}`;
}

export interface TestUser {
  id: string;
  email: string;
  name: string;
  password: string;
}

export async function makeUser(opts: { verified?: boolean; admin?: boolean; name?: string } = {}): Promise<TestUser> {
  const id = crypto.randomUUID();
  const email = `${unique("u")}@example.test`;
  const name = opts.name ?? `Tester ${counter}`;
  const ctx = await auth().$context;
  await db().insert(user).values({ id, name, email, emailVerified: opts.verified ?? true, role: opts.admin ? "admin" : "user" });
  await db().insert(account).values({ id: crypto.randomUUID(), accountId: id, providerId: "credential", userId: id, password: await ctx.password.hash(TEST_PASSWORD) });
  return { id, email, name, password: TEST_PASSWORD };
}

/** A session cookie for the user, made by better-auth's own sign-in (server API, no rate limit). */
export async function sessionCookie(u: TestUser): Promise<string> {
  const res = await auth().api.signInEmail({ body: { email: u.email, password: u.password }, asResponse: true });
  if (res.status !== 200) throw new Error(`test sign-in failed: ${res.status} ${await res.text()}`);
  return res.headers
    .getSetCookie()
    .map((c) => c.split(";")[0])
    .join("; ");
}

export async function makeEvent(title = "Test Party"): Promise<{ id: string; slug: string }> {
  const slug = unique("event");
  const [e] = await db().insert(events).values({ slug, title, timeZone: "Europe/Berlin" }).returning();
  return { id: e.id, slug };
}

export async function grantEventRole(eventId: string, userId: string, role: "organizer" | "judge"): Promise<void> {
  await db().insert(eventRoles).values({ eventId, userId, role });
}

/** A Request as React Router hands it to a loader or action. */
export function request(
  path: string,
  init: { cookie?: string; method?: string; form?: Record<string, string>; json?: unknown; headers?: Record<string, string> } = {},
): Request {
  const headers = new Headers(init.headers);
  if (init.cookie) headers.set("cookie", init.cookie);
  let body: BodyInit | undefined;
  if (init.form) body = new URLSearchParams(init.form);
  if (init.json !== undefined) {
    body = JSON.stringify(init.json);
    headers.set("content-type", "application/json");
  }
  return new Request(new URL(path, process.env.APP_URL ?? "http://127.0.0.1:3000"), { method: init.method ?? (body ? "POST" : "GET"), headers, body });
}
