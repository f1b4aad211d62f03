import { and, eq } from "drizzle-orm";
import { db } from "~/db/client.server";
import { artifacts, checkRuns, competitions, crewMembers, entries, eventRoles, juryAssignments, uploads } from "~/db/schema";
import { isAdmin, type SessionUser } from "~/auth/guards.server";
import { countingUpload } from "./report.server";
import { isId } from "~/security/ids";

/**
 * Who may see an entry's check reports and artifacts: its crew, the event's organizers, the competition's
 * judges and platform admins always; everyone once the entry is on the public showcase (competition closed or
 * later, entry not disqualified) — and then only the counting upload's artifacts.
 */
const PUBLIC_STATES = new Set(["closed", "judging", "results"]);

export async function entryViewer(user: SessionUser | null, entryId: string): Promise<"insider" | "public" | null> {
  if (!isId(entryId)) return null;
  const [row] = await db()
    .select({ entry: entries, eventId: competitions.eventId, competitionState: competitions.state })
    .from(entries)
    .innerJoin(competitions, eq(competitions.id, entries.competitionId))
    .where(eq(entries.id, entryId));
  if (!row) return null;
  if (user) {
    if (isAdmin(user)) return "insider";
    const [member] = await db().select().from(crewMembers).where(and(eq(crewMembers.crewId, row.entry.crewId), eq(crewMembers.userId, user.id)));
    if (member) return "insider";
    const [organizer] = await db()
      .select()
      .from(eventRoles)
      .where(and(eq(eventRoles.eventId, row.eventId), eq(eventRoles.userId, user.id), eq(eventRoles.role, "organizer")));
    if (organizer) return "insider";
    const [judge] = await db()
      .select()
      .from(juryAssignments)
      .where(and(eq(juryAssignments.competitionId, row.entry.competitionId), eq(juryAssignments.judgeUserId, user.id)));
    if (judge) return "insider";
  }
  return PUBLIC_STATES.has(row.competitionState) && row.entry.state === "active" ? "public" : null;
}

/** The artifact row if this viewer may fetch it, else null (the route answers 404 either way). */
export async function viewableArtifact(user: SessionUser | null, artifactId: string) {
  if (!isId(artifactId)) return null;
  const [row] = await db()
    .select({ artifact: artifacts, uploadId: uploads.id, entryId: uploads.entryId })
    .from(artifacts)
    .innerJoin(checkRuns, eq(checkRuns.id, artifacts.checkRunId))
    .innerJoin(uploads, eq(uploads.id, checkRuns.uploadId))
    .where(eq(artifacts.id, artifactId));
  if (!row) return null;
  const viewer = await entryViewer(user, row.entryId);
  if (viewer === "insider") return row.artifact;
  if (viewer === "public" && (await countingUpload(row.entryId))?.id === row.uploadId) return row.artifact;
  return null;
}
