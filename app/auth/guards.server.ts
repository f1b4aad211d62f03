import { and, eq, inArray } from "drizzle-orm";
import { data, redirect } from "react-router";
import { db } from "~/db/client.server";
import { crewMembers, eventRoles } from "~/db/schema";
import { auth, type AuthSession } from "./auth.server";

/**
 * Permission helpers used at the top of every loader and action. Pages get a redirect to sign-in when
 * anonymous and a 403 when signed in without the role; JSON API routes get the API error shape instead
 * (see ~/api/json.server).
 */
export type SessionUser = AuthSession["user"];
export type EventRole = "organizer" | "judge";

export async function getSession(request: Request): Promise<AuthSession | null> {
  return auth().api.getSession({ headers: request.headers });
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

export async function requireUser(request: Request): Promise<SessionUser> {
  const s = await getSession(request);
  if (!s) signInRedirect(request);
  return s.user;
}

export async function requireAdmin(request: Request): Promise<SessionUser> {
  const user = await requireUser(request);
  if (!isAdmin(user)) forbidden();
  return user;
}

export async function eventRolesOf(userId: string, eventId: string): Promise<EventRole[]> {
  const rows = await db()
    .select({ role: eventRoles.role })
    .from(eventRoles)
    .where(and(eq(eventRoles.userId, userId), eq(eventRoles.eventId, eventId)));
  return rows.map((r) => r.role);
}

/** The user must hold one of `roles` in the event (a platform admin passes as organizer). */
export async function requireEventRole(request: Request, eventId: string, roles: EventRole[]): Promise<{ user: SessionUser; roles: EventRole[] }> {
  const user = await requireUser(request);
  const held = await eventRolesOf(user.id, eventId);
  const ok = held.some((r) => roles.includes(r)) || (isAdmin(user) && roles.includes("organizer"));
  if (!ok) forbidden();
  return { user, roles: held };
}

export async function crewIdsOf(userId: string): Promise<string[]> {
  const rows = await db().select({ crewId: crewMembers.crewId }).from(crewMembers).where(eq(crewMembers.userId, userId));
  return rows.map((r) => r.crewId);
}

export async function requireCrewMember(request: Request, crewId: string): Promise<SessionUser> {
  const user = await requireUser(request);
  const rows = await db()
    .select({ crewId: crewMembers.crewId })
    .from(crewMembers)
    .where(and(eq(crewMembers.userId, user.id), inArray(crewMembers.crewId, [crewId])));
  if (rows.length === 0) forbidden("Only members of this crew can do that.");
  return user;
}
