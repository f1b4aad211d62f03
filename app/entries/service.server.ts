import { and, desc, eq, inArray, ne } from "drizzle-orm";
import { isAdmin, type SessionUser } from "~/auth/guards.server";
import { competitions, crewMembers, crews, entries, eventRoles, events, uploadFiles, uploads } from "~/db/schema";
import { db } from "~/db/client.server";
import { parseRuleset, type Ruleset } from "~/rules/ruleset";
import { audit } from "~/audit/log.server";
import { cutoffOf } from "./deadline";
import { countingUploads } from "./counting.server";
import type { UploadRow } from "./shapes";
import { isId } from "~/security/ids";
import { conflict, forbidden } from "~/errors/app-error";

/** Entries: who may see one, creating one in an open competition, and the dashboard's data. */
export function rulesetOf(raw: unknown): Ruleset {
  // A competition without a stored ruleset is checked against the defaults (only topModule and pins are required there).
  return parseRuleset(raw ?? { topModule: "gc_entry", pins: [{ name: "clk", direction: "input", width: 1, role: "clock" }] });
}

export async function competitionBySlugs(eventSlug: string, competitionSlug: string) {
  const [row] = await db()
    .select({ competition: competitions, event: events })
    .from(competitions)
    .innerJoin(events, eq(events.id, competitions.eventId))
    .where(and(eq(events.slug, eventSlug), eq(competitions.slug, competitionSlug), ne(competitions.state, "draft")));
  return row ?? null;
}

export type EntryViewer = { role: "crew" } | { role: "organizer" };

/** The entry with its competition and event, if `user` is in its crew or organizes its event; else null (→ 404). */
export async function entryForViewer(entryId: string, u: SessionUser) {
  if (!isId(entryId)) return null;
  const [row] = await db()
    .select({ entry: entries, competition: competitions, event: events, crew: crews })
    .from(entries)
    .innerJoin(competitions, eq(competitions.id, entries.competitionId))
    .innerJoin(events, eq(events.id, competitions.eventId))
    .innerJoin(crews, eq(crews.id, entries.crewId))
    .where(eq(entries.id, entryId));
  if (!row) return null;
  const [member] = await db()
    .select({ role: crewMembers.role })
    .from(crewMembers)
    .where(and(eq(crewMembers.crewId, row.entry.crewId), eq(crewMembers.userId, u.id)));
  if (member) return { ...row, viewer: { role: "crew" } as EntryViewer };
  const [org] = await db()
    .select({ id: eventRoles.id })
    .from(eventRoles)
    .where(and(eq(eventRoles.eventId, row.event.id), eq(eventRoles.userId, u.id), eq(eventRoles.role, "organizer")));
  if (org || isAdmin(u)) return { ...row, viewer: { role: "organizer" } as EntryViewer };
  return null;
}

/** A new entry of one of the user's crews; refusals are AppErrors (one about the crew names the `crewId` field). */
export async function createEntry(
  u: SessionUser,
  competitionId: string,
  input: { crewId: string; title: string; description: string },
  now = new Date(),
): Promise<{ entryId: string }> {
  const [member] = await db()
    .select({ role: crewMembers.role })
    .from(crewMembers)
    .where(and(eq(crewMembers.crewId, input.crewId), eq(crewMembers.userId, u.id)));
  if (!member) throw forbidden("not_crew_member", "You can only enter with a crew you are in.", { fieldErrors: { crewId: ["You can only enter with a crew you are in."] } });
  return db().transaction(async (tx) => {
    const [c] = await tx.select().from(competitions).where(eq(competitions.id, competitionId)).for("share");
    if (!c || c.state !== "open") throw conflict("entries_closed", "This competition is not open for entries.");
    const cutoff = cutoffOf(c.deadlineAt, c.graceMinutes);
    if (cutoff && now >= cutoff) throw conflict("deadline_passed", "The deadline of this competition has passed.");
    const [e] = await tx
      .insert(entries)
      .values({ competitionId, crewId: input.crewId, title: input.title, description: input.description, feeState: c.feeAmount === 0 ? "not_required" : "unpaid" })
      .onConflictDoNothing({ target: [entries.competitionId, entries.crewId] })
      .returning({ id: entries.id });
    if (!e) throw conflict("already_entered", "This crew already has an entry in this competition.", { fieldErrors: { crewId: ["This crew already has an entry in this competition."] } });
    await audit({ actorUserId: u.id, eventId: c.eventId, action: "entry.create", subjectType: "entry", subjectId: e.id, details: { crewId: input.crewId } }, tx);
    return { entryId: e.id };
  });
}

/** The entries of every crew `userId` is a member of, with crew, compo and event names (the "My entries" page). */
export async function entriesOfMember(userId: string) {
  return db()
    .select({
      id: entries.id,
      title: entries.title,
      feeState: entries.feeState,
      state: entries.state,
      crewId: entries.crewId,
      competitionId: entries.competitionId,
      crew: crews.name,
      competition: competitions.title,
      competitionState: competitions.state,
      event: events.title,
    })
    .from(entries)
    .innerJoin(crewMembers, and(eq(crewMembers.crewId, entries.crewId), eq(crewMembers.userId, userId)))
    .innerJoin(crews, eq(crews.id, entries.crewId))
    .innerJoin(competitions, eq(competitions.id, entries.competitionId))
    .innerJoin(events, eq(events.id, competitions.eventId));
}

/** Entries of the crews `userId` belongs to, in the existing competitions they entered. */
export async function entriesOfCrewsOf(crewIds: string[]) {
  if (crewIds.length === 0) return [];
  return db()
    .select({ id: entries.id, competitionId: entries.competitionId, crewId: entries.crewId })
    .from(entries)
    .where(inArray(entries.crewId, crewIds));
}


/** Recorded uploads (complete and late), newest first, with which one counts. Pending and abandoned ones are not uploads. */
export async function uploadsOfEntry(entryId: string): Promise<UploadRow[]> {
  const ups = await db()
    .select()
    .from(uploads)
    .where(and(eq(uploads.entryId, entryId), inArray(uploads.state, ["complete", "late"])))
    .orderBy(desc(uploads.number));
  if (ups.length === 0) return [];
  const files = await db()
    .select()
    .from(uploadFiles)
    .where(and(inArray(uploadFiles.uploadId, ups.map((u) => u.id)), eq(uploadFiles.state, "confirmed")));
  const counting = (await countingUploads([entryId])).get(entryId);
  const order = ["bundle", "layout", "video", "still"];
  return ups.map((u) => ({
    id: u.id,
    number: u.number,
    state: u.state as "complete" | "late",
    completedAt: (u.completedAt ?? u.createdAt).toISOString(),
    counts: u.id === counting?.id,
    picked: u.id === counting?.id && counting.picked,
    lateException: u.lateException,
    repository: u.repositoryUrl && u.repositoryCommit ? { url: u.repositoryUrl, commit: u.repositoryCommit } : null,
    licence: u.licence,
    files: files
      .filter((f) => f.uploadId === u.id)
      .sort((a, b) => order.indexOf(a.kind) - order.indexOf(b.kind))
      .map((f) => ({ kind: f.kind, filename: f.filename, sizeBytes: f.sizeBytes ?? 0, sha256: f.sha256 ?? "", mediaType: f.mediaType ?? "" })),
  }));
}
