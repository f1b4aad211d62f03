import { count } from "drizzle-orm";
import { isAdmin, type SessionUser } from "~/auth/guards.server";
import { db } from "~/db/client.server";
import { competitions, entries, events, user } from "~/db/schema";
import { forbidden } from "~/errors/app-error";

/** The platform's size for the admin page. Only a platform admin sees it (the route's guard, and here again). */
export async function platformCounts(viewer: SessionUser): Promise<{ users: number; events: number; competitions: number; entries: number }> {
  if (!isAdmin(viewer)) throw forbidden("admin_only", "Only a platform admin sees this.");
  const [[u], [e], [c], [n]] = await Promise.all([
    db().select({ n: count() }).from(user),
    db().select({ n: count() }).from(events),
    db().select({ n: count() }).from(competitions),
    db().select({ n: count() }).from(entries),
  ]);
  return { users: u.n, events: e.n, competitions: c.n, entries: n.n };
}
