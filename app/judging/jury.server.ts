import { createHash, randomBytes } from "node:crypto";
import { and, asc, desc, eq, inArray } from "drizzle-orm";
import { audit } from "~/audit/log.server";
import { db } from "~/db/client.server";
import { competitions, conflicts, eventRoles, events, judgeInvites, juryAssignments, user } from "~/db/schema";
import { enqueueMail } from "~/mail/outbox.server";
import { composeMail } from "~/mail/templates";
import type { JudgingCompetition } from "./access.server";
import { conflictMap, judgedEntries } from "./entries.server";
import { AppError } from "~/errors/app-error";

/** The organizer's side of the jury: invitations, assignments, conflicts, blind judging, order, closing. */
export const INVITE_DAYS = 14;

export function hashToken(token: string): string {
  return createHash("sha256").update(token).digest("hex");
}

export interface JuryOverview {
  judges: { id: string; name: string; email: string; assigned: boolean }[];
  invites: { id: string; email: string; expiresAt: string; acceptedAt: string | null; expired: boolean }[];
  entries: { id: string; title: string; crew: string }[];
  conflicts: { id: string | null; judgeId: string; judgeName: string; entryId: string; entryTitle: string; kind: "crew" | "declared"; reason: string }[];
  withoutUpload: number;
}

export async function juryOverview(c: JudgingCompetition): Promise<JuryOverview> {
  const judgeRows = await db()
    .select({ id: user.id, name: user.name, email: user.email })
    .from(eventRoles)
    .innerJoin(user, eq(user.id, eventRoles.userId))
    .where(and(eq(eventRoles.eventId, c.eventId), eq(eventRoles.role, "judge")))
    .orderBy(asc(user.name));
  const assigned = new Set(
    (await db().select({ id: juryAssignments.judgeUserId }).from(juryAssignments).where(eq(juryAssignments.competitionId, c.id))).map((r) => r.id),
  );
  const invites = await db()
    .select({ id: judgeInvites.id, email: judgeInvites.email, expiresAt: judgeInvites.expiresAt, acceptedAt: judgeInvites.acceptedAt })
    .from(judgeInvites)
    .where(eq(judgeInvites.eventId, c.eventId))
    .orderBy(desc(judgeInvites.createdAt));
  const { entries, withoutUpload } = await judgedEntries(c.id);
  const judgeIds = judgeRows.map((j) => j.id);
  const map = await conflictMap(judgeIds, entries);
  const list: JuryOverview["conflicts"] = [];
  for (const [key, v] of map) {
    const [judgeId, entryId] = key.split(":");
    list.push({
      id: v.id ?? null,
      judgeId,
      judgeName: judgeRows.find((j) => j.id === judgeId)?.name ?? judgeId,
      entryId,
      entryTitle: entries.find((e) => e.id === entryId)?.title ?? entryId,
      kind: v.kind,
      reason: v.reason,
    });
  }
  list.sort((a, b) => a.judgeName.localeCompare(b.judgeName) || a.entryTitle.localeCompare(b.entryTitle));
  const now = Date.now();
  return {
    judges: judgeRows.map((j) => ({ ...j, assigned: assigned.has(j.id) })),
    invites: invites.map((i) => ({
      id: i.id,
      email: i.email,
      expiresAt: i.expiresAt.toISOString(),
      acceptedAt: i.acceptedAt?.toISOString() ?? null,
      expired: !i.acceptedAt && i.expiresAt.getTime() < now,
    })),
    entries: entries.map((e) => ({ id: e.id, title: e.title, crew: e.crewName })),
    conflicts: list,
    withoutUpload,
  };
}

/** Invites an address to judge at the competition's event: stores only the token's SHA-256, mails the link. */
export async function inviteJudge(a: { competition: JudgingCompetition; email: string; invitedBy: string; appUrl: string }): Promise<{ inviteId: string; token: string }> {
  const email = a.email.trim().toLowerCase();
  const [already] = await db()
    .select({ id: user.id })
    .from(eventRoles)
    .innerJoin(user, eq(user.id, eventRoles.userId))
    .where(and(eq(eventRoles.eventId, a.competition.eventId), eq(eventRoles.role, "judge"), eq(user.email, email)));
  if (already) throw new AppError(409, "already_judge", "That address already belongs to a judge of this event; assign them below.", { fieldErrors: { email: ["Already a judge of this event."] } });
  const token = randomBytes(32).toString("base64url");
  const expiresAt = new Date(Date.now() + INVITE_DAYS * 24 * 3600 * 1000);
  const [row] = await db()
    .insert(judgeInvites)
    .values({ eventId: a.competition.eventId, email, tokenHash: hashToken(token), expiresAt, createdBy: a.invitedBy })
    .returning({ id: judgeInvites.id });
  const link = new URL(`/judge-invites/${token}`, a.appUrl).toString();
  await enqueueMail(
    composeMail(
      email,
      `You are invited to judge at ${a.competition.eventTitle}`,
      [
        "Hello,",
        `The organizers of ${a.competition.eventTitle} invite you onto the jury. Accept while signed in with this address (${email}); ` +
          `if you have no Gatecrash account yet, create one with it first. The link works for ${INVITE_DAYS} days:`,
        { text: "Accept the invitation", href: link },
        "If you did not expect this, ignore the mail; nothing happens unless you accept.",
      ],
      `judge-invite-${row.id}`,
    ),
  );
  await audit({ actorUserId: a.invitedBy, eventId: a.competition.eventId, action: "jury.invite", subjectType: "judge_invite", subjectId: row.id, details: { email } });
  return { inviteId: row.id, token };
}

export async function revokeInvite(c: JudgingCompetition, inviteId: string, actor: string): Promise<void> {
  const gone = await db()
    .delete(judgeInvites)
    .where(and(eq(judgeInvites.id, inviteId), eq(judgeInvites.eventId, c.eventId)))
    .returning({ id: judgeInvites.id, acceptedAt: judgeInvites.acceptedAt });
  if (gone.length === 0) throw new AppError(404, "not_found", "That invitation was not found.");
  await audit({ actorUserId: actor, eventId: c.eventId, action: "jury.invite-revoked", subjectType: "judge_invite", subjectId: inviteId });
}

export interface InviteView {
  eventTitle: string;
  email: string;
  state: "open" | "accepted" | "expired";
}

export async function findInvite(token: string): Promise<(InviteView & { id: string; eventId: string }) | null> {
  const [row] = await db()
    .select({ id: judgeInvites.id, eventId: judgeInvites.eventId, email: judgeInvites.email, expiresAt: judgeInvites.expiresAt, acceptedAt: judgeInvites.acceptedAt, eventTitle: events.title })
    .from(judgeInvites)
    .innerJoin(events, eq(events.id, judgeInvites.eventId))
    .where(eq(judgeInvites.tokenHash, hashToken(token)));
  if (!row) return null;
  const state = row.acceptedAt ? "accepted" : row.expiresAt.getTime() < Date.now() ? "expired" : "open";
  return { id: row.id, eventId: row.eventId, eventTitle: row.eventTitle, email: row.email, state };
}

/** Accepts an invitation as the signed-in user, who must hold the invited address. Grants the event's judge role. */
export async function acceptInvite(token: string, accepter: { id: string; email: string }): Promise<{ eventId: string }> {
  const invite = await findInvite(token);
  if (!invite) throw new AppError(404, "not_found", "This invitation does not exist or was withdrawn.");
  if (invite.state === "expired") throw new AppError(410, "expired", "This invitation has expired. Ask the organizers for a new one.");
  if (invite.state === "accepted") throw new AppError(409, "already_accepted", "This invitation was already accepted.");
  if (invite.email.toLowerCase() !== accepter.email.toLowerCase())
    throw new AppError(403, "wrong_account", `This invitation was sent to ${invite.email}. Sign in with that address to accept it.`);
  await db().transaction(async (tx) => {
    await tx.insert(eventRoles).values({ eventId: invite.eventId, userId: accepter.id, role: "judge" }).onConflictDoNothing();
    await tx.update(judgeInvites).set({ acceptedAt: new Date() }).where(eq(judgeInvites.id, invite.id));
  });
  await audit({ actorUserId: accepter.id, eventId: invite.eventId, action: "jury.invite-accepted", subjectType: "judge_invite", subjectId: invite.id });
  return { eventId: invite.eventId };
}

async function requireEventJudge(c: JudgingCompetition, judgeUserId: string): Promise<void> {
  const [row] = await db()
    .select({ id: eventRoles.id })
    .from(eventRoles)
    .where(and(eq(eventRoles.eventId, c.eventId), eq(eventRoles.userId, judgeUserId), eq(eventRoles.role, "judge")));
  if (!row) throw new AppError(404, "not_found", "That person is not a judge of this event.");
}

export async function setAssignment(c: JudgingCompetition, judgeUserId: string, assigned: boolean, actor: string): Promise<void> {
  await requireEventJudge(c, judgeUserId);
  if (assigned) await db().insert(juryAssignments).values({ competitionId: c.id, judgeUserId }).onConflictDoNothing();
  else await db().delete(juryAssignments).where(and(eq(juryAssignments.competitionId, c.id), eq(juryAssignments.judgeUserId, judgeUserId)));
  await audit({ actorUserId: actor, eventId: c.eventId, action: assigned ? "jury.assign" : "jury.unassign", subjectType: "competition", subjectId: c.id, details: { judgeUserId } });
}

export async function setJudgingOptions(c: JudgingCompetition, o: { blindJudging: boolean; orderMode: "shared" | "per-judge" }, actor: string): Promise<void> {
  await db().update(competitions).set({ blindJudging: o.blindJudging, orderMode: o.orderMode, updatedAt: new Date() }).where(eq(competitions.id, c.id));
  await audit({
    actorUserId: actor,
    eventId: c.eventId,
    action: "jury.options",
    subjectType: "competition",
    subjectId: c.id,
    details: { before: { blindJudging: c.blindJudging, orderMode: c.orderMode }, after: o },
  });
}

/** Closes (locks) or reopens judging. Both are logged; reopening is the organizer's deliberate act. */
export async function setJudgingLocked(c: JudgingCompetition, locked: boolean, actor: string, reason: string): Promise<void> {
  await db().update(competitions).set({ judgingLocked: locked, updatedAt: new Date() }).where(eq(competitions.id, c.id));
  await audit({ actorUserId: actor, eventId: c.eventId, action: locked ? "judging.closed" : "judging.reopened", subjectType: "competition", subjectId: c.id, details: { reason } });
}

export async function setJuryMethod(c: JudgingCompetition, method: "jury-raw" | "jury-z", actor: string): Promise<void> {
  await db().update(competitions).set({ juryMethod: method, updatedAt: new Date() }).where(eq(competitions.id, c.id));
  await audit({ actorUserId: actor, eventId: c.eventId, action: "standings.jury-method", subjectType: "competition", subjectId: c.id, details: { from: c.juryMethod, to: method } });
}

/** Declares a conflict (by the judge themself or by the organizer). The entry must be one this competition judges. */
export async function declareConflict(c: JudgingCompetition, a: { entryId: string; judgeUserId: string; reason: string; declaredBy: string }): Promise<void> {
  const { entries } = await judgedEntries(c.id);
  if (!entries.some((e) => e.id === a.entryId)) throw new AppError(404, "not_found", "That entry is not judged in this compo.");
  await requireEventJudge(c, a.judgeUserId);
  const [row] = await db()
    .insert(conflicts)
    .values({ entryId: a.entryId, judgeUserId: a.judgeUserId, reason: a.reason, declaredBy: a.declaredBy })
    .onConflictDoUpdate({ target: [conflicts.entryId, conflicts.judgeUserId], set: { reason: a.reason, declaredBy: a.declaredBy } })
    .returning({ id: conflicts.id });
  await audit({ actorUserId: a.declaredBy, eventId: c.eventId, action: "jury.conflict-declared", subjectType: "conflict", subjectId: row.id, details: { entryId: a.entryId, judgeUserId: a.judgeUserId, reason: a.reason } });
}

/** Organizer only: withdraws a declared conflict (automatic crew conflicts cannot be withdrawn). */
export async function removeConflict(c: JudgingCompetition, conflictId: string, actor: string): Promise<void> {
  const { entries } = await judgedEntries(c.id);
  const ids = entries.map((e) => e.id);
  const gone = ids.length
    ? await db()
        .delete(conflicts)
        .where(and(eq(conflicts.id, conflictId), inArray(conflicts.entryId, ids)))
        .returning({ id: conflicts.id })
    : [];
  if (gone.length === 0) throw new AppError(404, "not_found", "That conflict was not found.");
  await audit({ actorUserId: actor, eventId: c.eventId, action: "jury.conflict-removed", subjectType: "conflict", subjectId: conflictId });
}
