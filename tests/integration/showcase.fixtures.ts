import { eq } from "drizzle-orm";
import { db } from "~/db/client.server";
import { artifacts, checkRuns, competitions, crewMembers, crews, criteria, entries, scores, scoresheets, uploadFiles, uploads } from "~/db/schema";
import { grantEventRole, makeEvent, makeUser, sessionCookie, unique, type TestUser } from "../support/users";

/**
 * Builds a competition with entries, counting uploads, check runs and artifacts, criteria and jury scores,
 * for the showcase, voting and results tests. All data is made up here.
 */
export interface CompoFixture {
  event: { id: string; slug: string };
  competitionId: string;
  slug: string;
  organizer: TestUser;
  organizerCookie: string;
  entries: { id: string; title: string; crew: string; uploadId: string; member: TestUser }[];
  disqualified: { id: string; title: string };
  noUpload: { id: string; title: string };
  criteria: { id: string; name: string }[];
  judges: TestUser[];
}

const HOUR = 3600_000;

export async function makeCompo(opts: {
  state?: "open" | "closed" | "judging" | "results";
  method?: "points" | "borda" | "schulze";
  blind?: boolean;
  entryCount?: number;
  votingOpensAt?: Date | null;
  votingClosesAt?: Date | null;
  juryWeightPct?: number;
  /** Another compo of the same party: its event and organizer. */
  party?: Pick<CompoFixture, "event" | "organizer">;
  title?: string;
} = {}): Promise<CompoFixture> {
  const event = opts.party?.event ?? (await makeEvent("Fixture Party"));
  const organizer = opts.party?.organizer ?? (await makeUser({ name: "Org Anizer" }));
  if (!opts.party) await grantEventRole(event.id, organizer.id, "organizer");
  const slug = unique("compo");
  const [c] = await db()
    .insert(competitions)
    .values({
      eventId: event.id,
      slug,
      title: opts.title ?? "Fixture Compo",
      description: "A compo made for a test.",
      state: opts.state ?? "judging",
      ballotMethod: opts.method ?? "points",
      blindJudging: opts.blind ?? true,
      juryWeightPct: opts.juryWeightPct ?? 50,
      juryMethod: "jury-raw",
      votingOpensAt: opts.votingOpensAt === undefined ? new Date(Date.now() - HOUR) : opts.votingOpensAt,
      votingClosesAt: opts.votingClosesAt === undefined ? new Date(Date.now() + HOUR) : opts.votingClosesAt,
    })
    .returning();

  const made: CompoFixture["entries"] = [];
  const makeEntry = async (title: string, state: "active" | "disqualified", withUpload: boolean) => {
    const member = await makeUser({ name: `Member of ${title}` });
    const [crew] = await db().insert(crews).values({ handle: unique("crew"), name: `Crew ${title}` }).returning();
    await db().insert(crewMembers).values({ crewId: crew.id, userId: member.id, role: "captain" });
    const [e] = await db()
      .insert(entries)
      .values({ competitionId: c.id, crewId: crew.id, title, description: `About ${title}.`, state, disqualifiedReason: state === "disqualified" ? "secret reason" : null })
      .returning();
    let uploadId = "";
    if (withUpload) {
      const [u] = await db().insert(uploads).values({ entryId: e.id, number: 1, state: "complete", submittedBy: member.id, completedAt: new Date() }).returning();
      uploadId = u.id;
      await db().insert(uploadFiles).values({
        uploadId: u.id,
        kind: "bundle",
        s3Key: `private/${unique("bundle")}.zip`,
        filename: "secret-design.zip",
        claimedBytes: 100,
        sizeBytes: 100,
        sha256: "f".repeat(64),
        state: "confirmed",
      });
    }
    return { id: e.id, title, crew: crew.name, uploadId, member };
  };
  const n = opts.entryCount ?? 3;
  for (let i = 0; i < n; i++) made.push(await makeEntry(`Entry ${String.fromCharCode(65 + i)}`, "active", true));
  const dq = await makeEntry("Banned Beam", "disqualified", true);
  const nu = await makeEntry("Never Uploaded", "active", false);

  const crit = await db()
    .insert(criteria)
    .values([
      { competitionId: c.id, name: "Visuals", weight: 2, scaleMin: 0, scaleMax: 10, position: 0 },
      { competitionId: c.id, name: "Sound", weight: 1, scaleMin: 0, scaleMax: 10, position: 1 },
    ])
    .returning();
  return {
    event,
    competitionId: c.id,
    slug,
    organizer,
    organizerCookie: await sessionCookie(organizer),
    entries: made,
    disqualified: { id: dq.id, title: dq.title },
    noUpload: { id: nu.id, title: nu.title },
    criteria: crit.map((k) => ({ id: k.id, name: k.name })),
    judges: [],
  };
}

/** A finished check run with figures and artifacts (rows only; the bytes are not needed by these tests). */
export async function addCheckRun(uploadId: string, flash: "pass" | "warn" | null, kinds: string[] = ["webm", "first-frame", "layout-svg"]): Promise<string> {
  const figures: Record<string, unknown> = {
    source: { cells: 2100, flipFlops: 140, sourceLines: 321 },
    layout: { matchedShape: "single", widthUm: 180, heightUm: 120, utilization: 0.62 },
  };
  if (flash) figures.flash = { verdict: flash, worstSecondFlashes: flash === "pass" ? 1 : 9 };
  const [run] = await db().insert(checkRuns).values({ uploadId, state: "done", verdict: "pass", figures, finishedAt: new Date() }).returning();
  for (const kind of kinds)
    await db().insert(artifacts).values({ checkRunId: run.id, kind, s3Key: `objkey/${unique(kind)}`, mediaType: kind === "webm" ? "video/webm" : kind === "layout-svg" ? "image/svg+xml" : "image/png", sizeBytes: 10, sha256: "a".repeat(64) });
  return run.id;
}

/** Judges with scores: `table[judge][entry] = [visuals, sound]`. */
export async function addScores(f: CompoFixture, table: number[][][]): Promise<TestUser[]> {
  const judges: TestUser[] = [];
  for (const row of table) {
    const judge = await makeUser({ name: "Judge" });
    await grantEventRole(f.event.id, judge.id, "judge");
    judges.push(judge);
    for (const [ei, values] of row.entries()) {
      const [sheet] = await db().insert(scoresheets).values({ entryId: f.entries[ei].id, judgeUserId: judge.id, note: "private note: do not leak" }).returning();
      await db().insert(scores).values(values.map((v, ci) => ({ scoresheetId: sheet.id, criterionId: f.criteria[ci].id, value: v })));
    }
  }
  f.judges = judges;
  return judges;
}

export async function setCompetition(id: string, values: Partial<typeof competitions.$inferInsert>): Promise<void> {
  await db().update(competitions).set(values).where(eq(competitions.id, id));
}
