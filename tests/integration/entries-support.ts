import { eq } from "drizzle-orm";
import { db } from "~/db/client.server";
import { competitions, crewMembers, crews, entries, events } from "~/db/schema";
import { TEST_RULESET } from "../support/rulesets";
import { makeUser, sessionCookie, unique, type TestUser } from "../support/users";
import { routeContext } from "../support/routes";

/** Fixtures for the entrant tests: each call makes its own event, competition, crew and entry. */
export async function makeCompetition(opts: { feeAmount?: number; deadlineAt?: Date | null; graceMinutes?: number; state?: "draft" | "open" | "closed"; timeZone?: string; ruleset?: unknown } = {}) {
  const [event] = await db().insert(events).values({ slug: unique("party"), title: "Test Party", timeZone: opts.timeZone ?? "Europe/Berlin" }).returning();
  const [competition] = await db()
    .insert(competitions)
    .values({
      eventId: event.id,
      slug: unique("compo"),
      title: "Tiny Compo",
      state: opts.state ?? "open",
      deadlineAt: opts.deadlineAt === undefined ? new Date(Date.now() + 7 * 86400_000) : opts.deadlineAt,
      graceMinutes: opts.graceMinutes ?? 0,
      feeAmount: opts.feeAmount ?? 0,
      feeCurrency: "eur",
      ruleset: opts.ruleset ?? TEST_RULESET,
    })
    .returning();
  return { event, competition };
}

export async function makeCrewWith(member: TestUser, role: "captain" | "member" = "captain") {
  const [crew] = await db().insert(crews).values({ handle: unique("crew"), name: "Test Crew", createdBy: member.id }).returning();
  await db().insert(crewMembers).values({ crewId: crew.id, userId: member.id, role });
  return crew;
}

export async function makeEntrySetup(opts: Parameters<typeof makeCompetition>[0] = {}) {
  const { event, competition } = await makeCompetition(opts);
  const entrant = await makeUser({ name: "Entrant" });
  const crew = await makeCrewWith(entrant);
  const [entry] = await db()
    .insert(entries)
    .values({ competitionId: competition.id, crewId: crew.id, title: "Beam Racer", feeState: competition.feeAmount === 0 ? "not_required" : "unpaid" })
    .returning();
  return { event, competition, entrant, crew, entry, cookie: await sessionCookie(entrant) };
}

export async function entryRow(id: string) {
  const [e] = await db().select().from(entries).where(eq(entries.id, id));
  return e;
}

/** Calls a JSON resource route's loader or action and reads its JSON, thrown API errors included. */
export async function callApi<T = Record<string, unknown>>(fn: unknown, req: Request, params: Record<string, string> = {}): Promise<{ status: number; body: T }> {
  let res: Response;
  try {
    res = (await (fn as (a: unknown) => Promise<Response>)({ request: req, params, context: await routeContext(req) })) as Response;
  } catch (thrown) {
    if (!(thrown instanceof Response)) throw thrown;
    res = thrown;
  }
  return { status: res.status, body: (await res.json()) as T };
}
