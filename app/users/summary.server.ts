import { eq } from "drizzle-orm";
import { db } from "~/db/client.server";
import { crewMembers, crews, eventRoles, events } from "~/db/schema";
import { isAdmin, type SessionUser } from "~/auth/guards.server";

/** What a signed-in person is in Gatecrash: drives the navigation and their home page. */
export interface RoleSummary {
  isAdmin: boolean;
  organizerOf: { id: string; slug: string; title: string }[];
  judgeOf: { id: string; slug: string; title: string }[];
  crews: { id: string; handle: string; name: string }[];
}

export async function roleSummary(user: SessionUser): Promise<RoleSummary> {
  const roles = await db()
    .select({ role: eventRoles.role, id: events.id, slug: events.slug, title: events.title })
    .from(eventRoles)
    .innerJoin(events, eq(events.id, eventRoles.eventId))
    .where(eq(eventRoles.userId, user.id));
  const myCrews = await db()
    .select({ id: crews.id, handle: crews.handle, name: crews.name })
    .from(crewMembers)
    .innerJoin(crews, eq(crews.id, crewMembers.crewId))
    .where(eq(crewMembers.userId, user.id));
  const pick = (role: string) => roles.filter((r) => r.role === role).map(({ id, slug, title }) => ({ id, slug, title }));
  return { isAdmin: isAdmin(user), organizerOf: pick("organizer"), judgeOf: pick("judge"), crews: myCrews };
}
