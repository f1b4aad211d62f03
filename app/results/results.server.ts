import { createHmac } from "node:crypto";
import { AppError } from "~/errors/app-error";
import { and, asc, desc, eq, inArray } from "drizzle-orm";
import { audit } from "~/audit/log.server";
import { db } from "~/db/client.server";
import { competitions, crewMembers, criteria, entries, events, resultsSnapshots, scores, scoresheets, user } from "~/db/schema";
import { env } from "~/env.server";
import { enqueueMail } from "~/mail/outbox.server";
import { juryStandings, type JuryStandings } from "~/scoring/jury";
import type { RecountInput } from "~/scoring/recount";
import { mixStandings } from "~/scoring/mix";
import { eligibleEntries } from "~/showcase/showcase.server";
import { ballotsForCount, tallyFor } from "~/voting/voting.server";
import { canonicalJson, CURRENT_HASH_SCHEME, isHashScheme, LEGACY_HASH_SCHEME, payloadHash } from "./canonical";
import { resultsMail } from "./mail";
import { RESULTS_FORMAT, type PublishedVersion, type ResultsPayload, type StandingRow, type Standings } from "./shapes";

/**
 * Standings (live, for the organizer's preview) and results (published, frozen). A published version is a
 * results_snapshots row whose payload is never updated; its SHA-256 is over the canonical JSON of the payload, by the scheme tagged on the row (app/results/canonical.ts).
 * A correction is a new version with a note. The payload carries the anonymised recount files, so what anyone
 * downloads is exactly what was counted.
 */



function pseudonym(kind: "judge" | "voter", competitionId: string, id: string): string {
  const mac = createHmac("sha256", env().BETTER_AUTH_SECRET).update(`${kind}:${competitionId}:${id}`).digest("hex");
  return `${kind}-${mac.slice(0, 10)}`;
}

function emptyJury(method: "jury-raw" | "jury-z"): JuryStandings {
  return { method, ranking: [], judges: [], entries: [], missing: [], rules: ["No criteria are set, so there are no jury figures."] };
}

/** Computes the standings as they are right now, with the recount files. Organizer-only data: scores are pseudonymised. */
export async function computeStandings(competitionId: string): Promise<Standings> {
  const [row] = await db()
    .select({ c: competitions, e: events })
    .from(competitions)
    .innerJoin(events, eq(events.id, competitions.eventId))
    .where(eq(competitions.id, competitionId));
  if (!row) throw new Error(`no competition ${competitionId}`);
  const { c, e } = row;
  const list = await eligibleEntries(c.id);
  const candidates = list.map((x) => x.id);

  const crit = await db().select().from(criteria).where(eq(criteria.competitionId, c.id)).orderBy(asc(criteria.position), asc(criteria.name));
  const scoreRows =
    candidates.length === 0 || crit.length === 0
      ? []
      : await db()
          .select({ judge: scoresheets.judgeUserId, candidate: scoresheets.entryId, criterion: scores.criterionId, value: scores.value })
          .from(scores)
          .innerJoin(scoresheets, eq(scoresheets.id, scores.scoresheetId))
          .where(and(inArray(scoresheets.entryId, candidates), inArray(scores.criterionId, crit.map((k) => k.id))));
  const anonScores = scoreRows
    .map((s) => ({ judge: pseudonym("judge", c.id, s.judge), candidate: s.candidate, criterion: s.criterion, value: s.value }))
    .sort((a, b) => a.judge.localeCompare(b.judge) || a.candidate.localeCompare(b.candidate) || a.criterion.localeCompare(b.criterion));
  const juryFile: Extract<RecountInput, { method: "jury-raw" | "jury-z" }> | null =
    crit.length === 0
      ? null
      : {
          method: c.juryMethod,
          criteria: crit.map((k) => ({ id: k.id, weight: k.weight, min: k.scaleMin, max: k.scaleMax })),
          scores: anonScores,
          candidates,
        };
  const jury = juryFile ? juryStandings(juryFile, c.juryMethod) : emptyJury(c.juryMethod);

  const counted = await ballotsForCount(c.id, c.ballotMethod);
  const anonBallots = counted
    .map((b) => ({ voter: pseudonym("voter", c.id, b.id), ...b.content }))
    .sort((a, b) => a.voter.localeCompare(b.voter));
  const audienceFile: RecountInput =
    c.ballotMethod === "points"
      ? { method: "points", ballots: anonBallots as { voter: string; points: Record<string, number> }[], candidates }
      : { method: c.ballotMethod, ballots: anonBallots as { voter: string; ranking: string[] }[], candidates };
  const audience = tallyFor(c.ballotMethod, counted.map((b) => b.content), candidates);

  const audienceWeightPct = 100 - c.juryWeightPct;
  const mixed = mixStandings({ jury, audience: audience.ranking.map((r) => ({ candidate: r.candidate, score: r.score })), audienceWeightPercent: audienceWeightPct });
  const byId = new Map(list.map((x) => [x.id, x]));
  const juryPlace = new Map(jury.ranking.map((r) => [r.candidate, r.place]));
  const audiencePlace = new Map(audience.ranking.map((r) => [r.candidate, r.place]));
  const mixedEntry = new Map(mixed.entries.map((m) => [m.candidate, m]));
  const juryScored = new Set(jury.entries.filter((x) => x.score !== null).map((x) => x.candidate));
  const audienceScored = new Set(audience.ranking.filter((x) => x.score !== null).map((x) => x.candidate));

  const standings: StandingRow[] = mixed.ranking.map((r) => {
    const m = mixedEntry.get(r.candidate)!;
    const entry = byId.get(r.candidate)!;
    return {
      place: r.place,
      tied: r.tied,
      entryId: r.candidate,
      title: entry.title,
      crew: entry.crewName,
      mixed: m.mixed,
      jury: { score: m.jury.score, normalised: m.jury.normalised, place: juryScored.has(r.candidate) ? (juryPlace.get(r.candidate) ?? null) : null },
      audience: { score: m.audience.score, normalised: m.audience.normalised, place: audienceScored.has(r.candidate) ? (audiencePlace.get(r.candidate) ?? null) : null },
    };
  });

  return {
    format: RESULTS_FORMAT,
    competition: { id: c.id, slug: c.slug, title: c.title, eventSlug: e.slug, eventTitle: e.title },
    method: { jury: c.juryMethod, audience: c.ballotMethod, juryWeightPct: c.juryWeightPct, audienceWeightPct },
    counts: { entries: list.length, judges: new Set(anonScores.map((s) => s.judge)).size, scores: anonScores.length, ballots: counted.length, ballotsSetAside: audience.rejected },
    criteria: crit.map((k) => ({ id: k.id, name: k.name, weight: k.weight, min: k.scaleMin, max: k.scaleMax })),
    standings,
    rules: { jury: jury.rules, mix: mixed.rules },
    recount: { jury: juryFile, audience: audienceFile },
  };
}


function toVersion(r: typeof resultsSnapshots.$inferSelect): PublishedVersion {
  const hashScheme = isHashScheme(r.hashScheme) ? r.hashScheme : LEGACY_HASH_SCHEME;
  return { id: r.id, version: r.version, sha256: r.sha256, hashScheme, note: r.note, publishedAt: r.publishedAt.toISOString(), payload: r.payload as ResultsPayload };
}

export async function publishedVersions(competitionId: string): Promise<{ version: number; note: string; publishedAt: string; sha256: string }[]> {
  const rows = await db()
    .select({ version: resultsSnapshots.version, note: resultsSnapshots.note, publishedAt: resultsSnapshots.publishedAt, sha256: resultsSnapshots.sha256 })
    .from(resultsSnapshots)
    .where(eq(resultsSnapshots.competitionId, competitionId))
    .orderBy(desc(resultsSnapshots.version));
  return rows.map((r) => ({ ...r, publishedAt: r.publishedAt.toISOString() }));
}

/** A published version (the newest when `version` is omitted); null when none. */
export async function publishedResults(competitionId: string, version?: number): Promise<PublishedVersion | null> {
  const [r] = await db()
    .select()
    .from(resultsSnapshots)
    .where(version === undefined ? eq(resultsSnapshots.competitionId, competitionId) : and(eq(resultsSnapshots.competitionId, competitionId), eq(resultsSnapshots.version, version)))
    .orderBy(desc(resultsSnapshots.version))
    .limit(1);
  return r ? toVersion(r) : null;
}

/** A refused publication (an AppError): about the note field, or about the compo's state. */
export class PublishError extends AppError {
  constructor(
    readonly field: "note" | "state",
    message: string,
  ) {
    super(field === "note" ? 400 : 409, field === "note" ? "invalid_body" : "not_publishable", message, field === "note" ? { fieldErrors: { note: [message] } } : {});
    this.name = "PublishError";
  }
}

export function resultsUrl(p: Pick<ResultsPayload, "competition">, version?: number): string {
  const base = `${env().APP_URL.replace(/\/$/, "")}/e/${p.competition.eventSlug}/${p.competition.slug}/results`;
  return version ? `${base}?version=${version}` : base;
}

/**
 * Freezes the current standings as the next version, moves the competition to results, and mails every
 * entrant their place (one mail per entry, member and version).
 */
export async function publishResults(competitionId: string, actorUserId: string, note: string): Promise<PublishedVersion> {
  const [c] = await db().select({ state: competitions.state, eventId: competitions.eventId }).from(competitions).where(eq(competitions.id, competitionId));
  if (!c) throw new Error(`no competition ${competitionId}`);
  if (!["closed", "judging", "results"].includes(c.state)) throw new PublishError("state", "Results can be published once entries have closed.");
  const standings = await computeStandings(competitionId);
  const trimmedNote = note.trim();

  const published = await db().transaction(async (tx) => {
    // Serialises publishers of the same competition.
    await tx.select({ id: competitions.id }).from(competitions).where(eq(competitions.id, competitionId)).for("update");
    const [last] = await tx.select({ version: resultsSnapshots.version }).from(resultsSnapshots).where(eq(resultsSnapshots.competitionId, competitionId)).orderBy(desc(resultsSnapshots.version)).limit(1);
    const version = (last?.version ?? 0) + 1;
    if (version > 1 && trimmedNote.length === 0) throw new PublishError("note", "A correction needs a note that says what changed and why; it is shown with the new version.");
    const payload: ResultsPayload = { ...standings, version, note: trimmedNote };
    // Round-trip once so what is hashed is exactly what JSON can carry.
    const frozen = JSON.parse(canonicalJson(payload)) as ResultsPayload;
    const [row] = await tx
      .insert(resultsSnapshots)
      .values({ competitionId, version, payload: frozen, sha256: payloadHash(frozen, CURRENT_HASH_SCHEME), hashScheme: CURRENT_HASH_SCHEME, note: trimmedNote, publishedBy: actorUserId })
      .returning();
    await tx.update(competitions).set({ state: "results", updatedAt: new Date() }).where(eq(competitions.id, competitionId));
    return toVersion(row);
  });

  await audit({
    actorUserId,
    eventId: c.eventId,
    action: published.version === 1 ? "results.published" : "results.corrected",
    subjectType: "competition",
    subjectId: competitionId,
    details: { version: published.version, sha256: published.sha256, hashScheme: published.hashScheme, note: published.note },
  });
  await mailEntrants(published);
  return published;
}

async function mailEntrants(p: PublishedVersion): Promise<void> {
  const ids = p.payload.standings.map((s) => s.entryId);
  if (ids.length === 0) return;
  const members = await db()
    .select({ entryId: entries.id, userId: user.id, email: user.email, name: user.name })
    .from(entries)
    .innerJoin(crewMembers, eq(crewMembers.crewId, entries.crewId))
    .innerJoin(user, eq(user.id, crewMembers.userId))
    .where(inArray(entries.id, ids));
  const rows = new Map(p.payload.standings.map((s) => [s.entryId, s]));
  for (const m of members) {
    const row = rows.get(m.entryId)!;
    await enqueueMail(
      resultsMail({
        to: m.email,
        name: m.name,
        row,
        payload: p.payload,
        url: resultsUrl(p.payload, p.version),
        dedupeKey: `results:${p.payload.competition.id}:v${p.version}:${m.entryId}:${m.userId}`,
      }),
    );
  }
}

/** Verifies a stored version by its own scheme: the hash of its canonical payload still equals the published hash. */
export function verifySnapshot(v: Pick<PublishedVersion, "payload" | "sha256" | "hashScheme">): boolean {
  return payloadHash(v.payload, v.hashScheme) === v.sha256;
}
