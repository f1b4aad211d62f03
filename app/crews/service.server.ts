import { createHash, randomBytes } from "node:crypto";
import { and, count, eq, gt, isNull } from "drizzle-orm";
import { audit } from "~/audit/log.server";
import { db } from "~/db/client.server";
import { competitions, crewInvites, crewMembers, crews, entries, events, user } from "~/db/schema";
import { env } from "~/env.server";
import { enqueueMail } from "~/mail/outbox.server";
import { composeMail } from "~/mail/templates";
import { AppError, conflict, forbidden, notFound } from "~/errors/app-error";
import { INVITE_DAYS, leaveDecision } from "./rules";

/**
 * Crews: create, invite by e-mail (token links; only the SHA-256 of a token is stored), accept, hand over, leave.
 * Refusals are AppErrors; one about a form field names it.
 */
export const hashToken = (token: string) => createHash("sha256").update(token).digest("hex");

export async function createCrew(userId: string, input: { handle: string; name: string }): Promise<{ id: string }> {
  return db().transaction(async (tx) => {
    const [crew] = await tx
      .insert(crews)
      .values({ handle: input.handle, name: input.name, createdBy: userId })
      .onConflictDoNothing({ target: crews.handle })
      .returning({ id: crews.id });
    if (!crew) throw conflict("handle_taken", `The handle "${input.handle}" is taken. Pick another.`, { fieldErrors: { handle: [`The handle "${input.handle}" is taken. Pick another.`] } });
    await tx.insert(crewMembers).values({ crewId: crew.id, userId, role: "captain" });
    return crew;
  });
}

export async function crewsOf(userId: string) {
  return db()
    .select({ id: crews.id, handle: crews.handle, name: crews.name, role: crewMembers.role })
    .from(crewMembers)
    .innerJoin(crews, eq(crews.id, crewMembers.crewId))
    .where(eq(crewMembers.userId, userId))
    .orderBy(crews.name);
}

/** The crew page, for a member only (null otherwise: the caller answers 404). */
export async function crewForMember(crewId: string, userId: string) {
  const [me] = await db()
    .select({ role: crewMembers.role })
    .from(crewMembers)
    .where(and(eq(crewMembers.crewId, crewId), eq(crewMembers.userId, userId)));
  if (!me) return null;
  const [crew] = await db().select().from(crews).where(eq(crews.id, crewId));
  const members = await db()
    .select({ userId: user.id, name: user.name, email: user.email, role: crewMembers.role, joinedAt: crewMembers.joinedAt })
    .from(crewMembers)
    .innerJoin(user, eq(user.id, crewMembers.userId))
    .where(eq(crewMembers.crewId, crewId))
    .orderBy(crewMembers.joinedAt);
  const invites = await db()
    .select({ id: crewInvites.id, email: crewInvites.email, expiresAt: crewInvites.expiresAt })
    .from(crewInvites)
    .where(and(eq(crewInvites.crewId, crewId), isNull(crewInvites.acceptedAt), gt(crewInvites.expiresAt, new Date())))
    .orderBy(crewInvites.createdAt);
  const crewEntries = await db()
    .select({ id: entries.id, title: entries.title, competition: competitions.title, event: events.title })
    .from(entries)
    .innerJoin(competitions, eq(competitions.id, entries.competitionId))
    .innerJoin(events, eq(events.id, competitions.eventId))
    .where(eq(entries.crewId, crewId));
  return { crew, myRole: me.role, members, invites, entries: crewEntries };
}

export async function inviteToCrew(crewId: string, actor: { id: string; name: string }, email: string, now = new Date()): Promise<{ inviteId: string }> {
  const members = await db()
    .select({ email: user.email })
    .from(crewMembers)
    .innerJoin(user, eq(user.id, crewMembers.userId))
    .where(eq(crewMembers.crewId, crewId));
  if (members.some((m) => m.email.toLowerCase() === email)) throw conflict("already_member", "That address already belongs to a member.", { fieldErrors: { email: ["That address already belongs to a member."] } });
  const [crew] = await db().select().from(crews).where(eq(crews.id, crewId));
  const token = randomBytes(32).toString("base64url");
  const expiresAt = new Date(now.getTime() + INVITE_DAYS * 86400_000);
  const [inv] = await db()
    .insert(crewInvites)
    .values({ crewId, email, tokenHash: hashToken(token), expiresAt, createdBy: actor.id })
    .returning({ id: crewInvites.id });
  const url = `${env().APP_URL}/invites/${token}`;
  await enqueueMail(
    composeMail(
      email,
      `Join the crew ${crew.name} on Gatecrash`,
      [
        `${actor.name} invites you to join the crew "${crew.name}" (@${crew.handle}) on Gatecrash, to enter tiny-silicon compos together.`,
        { text: "Join the crew", href: url },
        `The link works for ${INVITE_DAYS} days, with any Gatecrash account you sign in with. If you do not know this crew, ignore this mail.`,
      ],
      `crew-invite:${inv.id}`,
    ),
  );
  await audit({ actorUserId: actor.id, action: "crew.invite", subjectType: "crew", subjectId: crewId, details: { email } });
  return { inviteId: inv.id };
}

export async function inviteByToken(token: string) {
  const [row] = await db()
    .select({ id: crewInvites.id, crewId: crewInvites.crewId, email: crewInvites.email, expiresAt: crewInvites.expiresAt, acceptedAt: crewInvites.acceptedAt, crewName: crews.name, handle: crews.handle })
    .from(crewInvites)
    .innerJoin(crews, eq(crews.id, crewInvites.crewId))
    .where(eq(crewInvites.tokenHash, hashToken(token)));
  return row ?? null;
}

export type InviteProblem = "unknown" | "expired" | "used";
export function inviteProblem(inv: { expiresAt: Date; acceptedAt: Date | null } | null, now = new Date()): InviteProblem | null {
  if (!inv) return "unknown";
  if (inv.acceptedAt) return "used";
  if (inv.expiresAt.getTime() <= now.getTime()) return "expired";
  return null;
}

export const INVITE_PROBLEM_TEXT: Record<InviteProblem, string> = {
  unknown: "This invitation link is not valid. Ask the crew for a new one.",
  expired: "This invitation has expired. Ask the crew to invite you again.",
  used: "This invitation was already used.",
};

/** Accepting: any signed-in account joins. One use per token; joining twice is harmless. */
export async function acceptInvite(token: string, userId: string, now = new Date()): Promise<{ crewId: string }> {
  return db().transaction(async (tx) => {
    const [inv] = await tx.select().from(crewInvites).where(eq(crewInvites.tokenHash, hashToken(token))).for("update");
    const problem = inviteProblem(inv ?? null, now);
    if (problem) throw new AppError(problem === "unknown" ? 404 : 410, `invite_${problem}`, INVITE_PROBLEM_TEXT[problem]);
    await tx.update(crewInvites).set({ acceptedAt: now }).where(eq(crewInvites.id, inv.id));
    await tx.insert(crewMembers).values({ crewId: inv.crewId, userId, role: "member" }).onConflictDoNothing();
    return { crewId: inv.crewId };
  });
}

export async function makeCaptain(crewId: string, actorId: string, memberId: string): Promise<void> {
  const [me] = await db().select().from(crewMembers).where(and(eq(crewMembers.crewId, crewId), eq(crewMembers.userId, actorId)));
  if (me?.role !== "captain") throw forbidden("not_captain", "Only a captain can hand over the captaincy.");
  const res = await db()
    .update(crewMembers)
    .set({ role: "captain" })
    .where(and(eq(crewMembers.crewId, crewId), eq(crewMembers.userId, memberId)))
    .returning();
  if (res.length === 0) throw notFound("That person is not in this crew.");
  await audit({ actorUserId: actorId, action: "crew.captain", subjectType: "crew", subjectId: crewId, details: { memberId } });
}

export async function leaveCrew(crewId: string, userId: string): Promise<{ deletedCrew: boolean }> {
  return db().transaction(async (tx) => {
    // Lock the crew so two members leaving at once cannot both pass the last-captain rule.
    await tx.select({ id: crews.id }).from(crews).where(eq(crews.id, crewId)).for("update");
    const members = await tx.select().from(crewMembers).where(eq(crewMembers.crewId, crewId));
    const me = members.find((m) => m.userId === userId);
    if (!me) throw notFound("You are not in this crew.");
    const [{ n }] = await tx.select({ n: count() }).from(entries).where(eq(entries.crewId, crewId));
    const decision = leaveDecision({ role: me.role, captains: members.filter((m) => m.role === "captain").length, members: members.length, entries: n });
    if (!decision.ok) throw conflict("cannot_leave", decision.message);
    if (decision.deletesCrew) await tx.delete(crews).where(eq(crews.id, crewId));
    else await tx.delete(crewMembers).where(and(eq(crewMembers.crewId, crewId), eq(crewMembers.userId, userId)));
    return { deletedCrew: decision.deletesCrew };
  });
}
