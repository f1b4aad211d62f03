import { db } from "~/db/client.server";
import { competitions, crewMembers, crews, criteria, entries, juryAssignments, uploads } from "~/db/schema";
import { grantEventRole, makeEvent, makeUser, unique, type TestUser } from "../support/users";
import { routeContext } from "../support/routes";

/**
 * A compo in judging with its own organizer, judges and entries (each with its own crew, entrant and a complete
 * upload), made fresh for each test. Invented demo-like data; nothing from the demo scenario is reused.
 */
export interface Compo {
  event: { id: string; slug: string };
  competitionId: string;
  organizer: TestUser;
  judges: TestUser[];
  criteria: { id: string; name: string; weight: number; scaleMin: number; scaleMax: number }[];
  entries: { id: string; title: string; crewId: string; entrant: TestUser }[];
}

export async function makeCompo(
  opts: { judges?: number; entries?: number; criteria?: { name: string; weight: number; scaleMin?: number; scaleMax?: number }[]; blind?: boolean; title?: string } = {},
): Promise<Compo> {
  const event = await makeEvent(opts.title ?? "Judging Party");
  const organizer = await makeUser({ name: "Olga Organizer" });
  await grantEventRole(event.id, organizer.id, "organizer");
  const [comp] = await db()
    .insert(competitions)
    .values({ eventId: event.id, slug: unique("compo"), title: opts.title ?? "Beam Race", state: "judging", blindJudging: opts.blind ?? true })
    .returning();
  const crit = await db()
    .insert(criteria)
    .values(
      (opts.criteria ?? [
        { name: "Visuals", weight: 2 },
        { name: "Sound", weight: 1 },
      ]).map((c, i) => ({ competitionId: comp.id, name: c.name, weight: c.weight, scaleMin: c.scaleMin ?? 0, scaleMax: c.scaleMax ?? 10, position: i })),
    )
    .returning();
  const judges: TestUser[] = [];
  for (let i = 0; i < (opts.judges ?? 2); i++) {
    const j = await makeUser({ name: `Judge ${String.fromCharCode(65 + i)}` });
    await grantEventRole(event.id, j.id, "judge");
    await db().insert(juryAssignments).values({ competitionId: comp.id, judgeUserId: j.id });
    judges.push(j);
  }
  const made: Compo["entries"] = [];
  for (let i = 0; i < (opts.entries ?? 3); i++) {
    const entrant = await makeUser({ name: `Entrant ${i + 1}` });
    const [crew] = await db().insert(crews).values({ handle: unique("crew"), name: `Crew ${i + 1}` }).returning();
    await db().insert(crewMembers).values({ crewId: crew.id, userId: entrant.id, role: "captain" });
    const title = `Entry ${String.fromCharCode(65 + i)}`;
    const [entry] = await db().insert(entries).values({ competitionId: comp.id, crewId: crew.id, title, feeState: "not_required" }).returning();
    await db().insert(uploads).values({ entryId: entry.id, number: 1, state: "complete", completedAt: new Date() });
    made.push({ id: entry.id, title, crewId: crew.id, entrant });
  }
  return {
    event,
    competitionId: comp.id,
    organizer,
    judges,
    criteria: crit.map((c) => ({ id: c.id, name: c.name, weight: c.weight, scaleMin: c.scaleMin, scaleMax: c.scaleMax })),
    entries: made,
  };
}

/** Calls a JSON route's loader or action and reads its status and JSON body, whether it returned or threw. */
export async function callApi<T = Record<string, unknown>>(fn: unknown, req: Request, params: Record<string, string>): Promise<{ status: number; body: T }> {
  let res: unknown;
  try {
    res = await (fn as (a: unknown) => Promise<unknown>)({ request: req, params, context: await routeContext(req) });
  } catch (thrown) {
    res = thrown;
  }
  if (!(res instanceof Response)) throw new Error(`expected a Response, got ${String(res)}`);
  return { status: res.status, body: (await res.json()) as T };
}
