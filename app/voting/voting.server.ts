import { and, count, eq } from "drizzle-orm";
import { AppError } from "~/errors/app-error";
import { db } from "~/db/client.server";
import { ballotHistory, ballots, competitions } from "~/db/schema";
import { env } from "~/env.server";
import { tallyBorda, tallyPoints, tallySchulze, validateBallot, type BallotProblem, type PointsBallot, type RankedBallot } from "~/scoring/ballots";
import { eligibleEntries } from "~/showcase/showcase.server";
import { codeCounts, codesOfCompetition, issueVoteCodes, redeemCode, redeemedAtIn } from "./code-book.server";
import { codeHolderToken, normaliseCode, readCodeHolderToken, tokenMatches } from "./codes";
import { hitRateLimit } from "./rate-limit.server";
import { isId } from "~/security/ids";

/**
 * The audience vote. Rules (also shown on the vote page):
 * - The vote is open from votingOpensAt (inclusive) to votingClosesAt (exclusive), server time, while the
 *   competition is closed or in judging. Before and after, nothing is stored.
 * - Voters: signed-in accounts with a verified e-mail, or holders of a one-time vote code.
 * - One ballot per voter per competition; casting again replaces it until close. Every cast is kept in
 *   ballot_history (the full sequence of contents).
 * - A vote code is redeemed by its first valid ballot. The redeeming browser gets a holder token (cookie) and
 *   may change that ballot until close; typing the code again anywhere is refused as "already used".
 * - Rate limits: per voter (account or code) CAST_LIMIT casts per CAST_WINDOW_S seconds; per competition
 *   CODE_ATTEMPT_LIMIT failed code attempts per CODE_ATTEMPT_WINDOW_S (guessing).
 */
export const CAST_LIMIT = 10;
export const CAST_WINDOW_S = 60;
export const CODE_ATTEMPT_LIMIT = 20;
export const CODE_ATTEMPT_WINDOW_S = 60;

import type { BallotMethod } from "./shapes";
export type { BallotMethod };
export type BallotContent = PointsBallot | RankedBallot;
export type WindowStatus = "not-open" | "open" | "closed";

export type VoteErrorCode =
  | "not_found"
  | "voting_not_open"
  | "voting_closed"
  | "email_unverified"
  | "no_voter"
  | "code_unknown"
  | "code_used"
  | "code_invalid"
  | "invalid_ballot"
  | "rate_limited";

/**
 * A refused ballot, in the one failure shape (AppError): a ballot's problems are field errors of `ballot`, a code's
 * of `code`; pages show a code problem beside the code field and anything else above the form.
 */
export class VoteError extends AppError {
  declare readonly code: VoteErrorCode;

  constructor(
    code: VoteErrorCode,
    status: number,
    message: string,
    readonly problems: BallotProblem[] = [],
    readonly retryAfterSeconds?: number,
  ) {
    const codeProblem = code.startsWith("code_");
    super(status, code, message, {
      fieldErrors: problems.length ? { ballot: problems.map((p) => p.message) } : codeProblem ? { code: [message] } : undefined,
      formErrors: codeProblem ? [] : [message],
      headers: retryAfterSeconds ? { "Retry-After": String(retryAfterSeconds) } : undefined,
    });
    this.name = "VoteError";
  }
}

export interface WindowInput {
  state: string;
  votingOpensAt: Date | string | null;
  votingClosesAt: Date | string | null;
}

export function windowStatus(c: WindowInput, now = new Date()): WindowStatus {
  if (c.state === "results") return "closed";
  const opens = c.votingOpensAt ? new Date(c.votingOpensAt) : null;
  const closes = c.votingClosesAt ? new Date(c.votingClosesAt) : null;
  if (closes && now >= closes) return "closed";
  if (c.state !== "closed" && c.state !== "judging") return "not-open";
  if (!opens || now < opens) return "not-open";
  return "open";
}

export function ballotKind(method: BallotMethod): "points" | "ranked" {
  return method === "points" ? "points" : "ranked";
}

/** Who is voting, as the routes resolved it. */
export type Voter =
  | { kind: "user"; userId: string; emailVerified: boolean }
  | { kind: "code"; codeId: string }
  | { kind: "new-code"; code: string };

export function voterKey(v: Exclude<Voter, { kind: "new-code" }>): string {
  return v.kind === "user" ? `user:${v.userId}` : `code:${v.codeId}`;
}

export function codeCookieName(competitionId: string): string {
  return `gc_vote_${competitionId.replace(/-/g, "")}`;
}

/** Reads the code-holder cookie; the code id when the token is genuine for this competition. */
export async function codeHolderFromCookie(competitionId: string, cookieHeader: string | null): Promise<string | null> {
  if (!cookieHeader) return null;
  const name = codeCookieName(competitionId);
  const raw = cookieHeader
    .split(/;\s*/)
    .find((c) => c.startsWith(`${name}=`))
    ?.slice(name.length + 1);
  if (!raw) return null;
  const token = decodeURIComponent(raw);
  const parsed = readCodeHolderToken(token);
  if (!parsed || !isId(parsed.codeId)) return null;
  const redeemedAt = await redeemedAtIn(parsed.codeId, competitionId);
  if (!redeemedAt) return null;
  return tokenMatches(env().BETTER_AUTH_SECRET, token, parsed.codeId, competitionId, redeemedAt) ? parsed.codeId : null;
}

export function codeHolderCookie(competitionId: string, token: string, closesAt: Date | null): string {
  const maxAge = closesAt ? Math.max(60, Math.ceil((closesAt.getTime() - Date.now()) / 1000) + 86400) : 7 * 86400;
  const secure = env().APP_URL.startsWith("https:") ? "; Secure" : "";
  return `${codeCookieName(competitionId)}=${encodeURIComponent(token)}; Path=/; HttpOnly; SameSite=Lax; Max-Age=${maxAge}${secure}`;
}

async function loadCompetition(competitionId: string) {
  const [c] = await db().select().from(competitions).where(eq(competitions.id, competitionId));
  if (!c) throw new VoteError("not_found", 404, "This competition does not exist.");
  return c;
}

function refuseOutsideWindow(c: WindowInput, now: Date): void {
  const s = windowStatus(c, now);
  if (s === "not-open") throw new VoteError("voting_not_open", 409, "The audience vote has not opened yet. Nothing was stored.");
  if (s === "closed") throw new VoteError("voting_closed", 409, "The audience vote has closed. Nothing was stored.");
}

export interface CastResult {
  ballotId: string;
  replaced: boolean;
  content: BallotContent;
  /** Set when a vote code was redeemed by this cast: the holder token to keep in a cookie. */
  holderToken?: string;
}

export async function castBallot(opts: { competitionId: string; voter: Voter; content: unknown; now?: Date }): Promise<CastResult> {
  const now = opts.now ?? new Date();
  const c = await loadCompetition(opts.competitionId);
  refuseOutsideWindow(c, now);
  const v = opts.voter;
  if (v.kind === "user" && !v.emailVerified)
    throw new VoteError("email_unverified", 403, "Confirm your e-mail address first: only verified accounts may vote.");

  let normalisedCode: string | null = null;
  if (v.kind === "new-code") {
    normalisedCode = normaliseCode(v.code);
    if (!normalisedCode) throw new VoteError("code_invalid", 400, "A vote code has 8 letters and digits, like KX7M-Q2HD.");
  }

  const candidates = (await eligibleEntries(c.id)).map((e) => e.id);
  const kind = ballotKind(c.ballotMethod);
  const checked = kind === "points" ? validateBallot("points", opts.content, candidates) : validateBallot("ranked", opts.content, candidates);
  if (!checked.ok) throw new VoteError("invalid_ballot", 400, "This ballot cannot be counted: " + checked.problems.map((p) => p.message).join("; ") + ".", checked.problems);
  const content: BallotContent = checked.ballot;

  if (v.kind !== "new-code") {
    const hit = await hitRateLimit(`ballot:${c.id}:${voterKey(v)}`, CAST_LIMIT, CAST_WINDOW_S, now);
    if (!hit.allowed)
      throw new VoteError("rate_limited", 429, `Too many ballots in a short time. Try again in ${hit.retryAfterSeconds} s; your last ballot stands.`, [], hit.retryAfterSeconds);
  }

  type Cast = { ballotId: string; replaced: boolean; content: BallotContent; holderToken?: string } | { refused: "used" | "unknown" };
  const cast = await db().transaction(async (tx): Promise<Cast> => {
    let voterUserId: string | null = null;
    let voteCodeId: string | null = null;
    let holderToken: string | undefined;
    if (v.kind === "user") voterUserId = v.userId;
    else if (v.kind === "code") voteCodeId = v.codeId;
    else {
      const redeemed = await redeemCode(tx, c.id, normalisedCode!, now);
      // Refused after the transaction: the failed attempt must count even though nothing here is kept.
      if (redeemed.kind !== "redeemed") return { refused: redeemed.kind };
      voteCodeId = redeemed.codeId;
      holderToken = codeHolderToken(env().BETTER_AUTH_SECRET, redeemed.codeId, c.id, redeemed.redeemedAt);
    }

    const where = voterUserId ? eq(ballots.voterUserId, voterUserId) : eq(ballots.voteCodeId, voteCodeId!);
    const [existing] = await tx.select({ id: ballots.id }).from(ballots).where(and(eq(ballots.competitionId, c.id), where)).for("update");
    let ballotId: string;
    if (existing) {
      await tx.update(ballots).set({ content, method: c.ballotMethod, updatedAt: now }).where(eq(ballots.id, existing.id));
      ballotId = existing.id;
    } else {
      const [row] = await tx
        .insert(ballots)
        .values({ competitionId: c.id, voterUserId, voteCodeId, method: c.ballotMethod, content, createdAt: now, updatedAt: now })
        .onConflictDoUpdate({
          target: voterUserId ? [ballots.competitionId, ballots.voterUserId] : [ballots.competitionId, ballots.voteCodeId],
          set: { content, method: c.ballotMethod, updatedAt: now },
        })
        .returning({ id: ballots.id });
      ballotId = row.id;
    }
    await tx.insert(ballotHistory).values({ ballotId, content, changedAt: now });
    return { ballotId, replaced: Boolean(existing), content, holderToken };
  });
  if (!("refused" in cast)) return cast;
  return refuseCode(c.id, cast.refused, now);
}

/** A code that redeemed nothing: counted against the competition's guessing limit, then told apart (used or unknown). */
async function refuseCode(competitionId: string, refused: "used" | "unknown", now: Date): Promise<never> {
  const hit = await hitRateLimit(`code-attempts:${competitionId}`, CODE_ATTEMPT_LIMIT, CODE_ATTEMPT_WINDOW_S, now);
  if (!hit.allowed) throw new VoteError("rate_limited", 429, `Too many wrong codes here just now. Try again in ${hit.retryAfterSeconds} s.`, [], hit.retryAfterSeconds);
  if (refused === "used") throw new VoteError("code_used", 409, "This vote code has already been used in this compo. Each code makes one ballot per compo, changeable only from the browser that used it.");
  throw new VoteError("code_unknown", 404, "This vote code does not vote in this compo. Check the letters on your slip, and the compos printed on it.");
}

export async function currentBallot(competitionId: string, voter: Exclude<Voter, { kind: "new-code" }>) {
  const where = voter.kind === "user" ? eq(ballots.voterUserId, voter.userId) : eq(ballots.voteCodeId, voter.codeId);
  const [b] = await db()
    .select({ content: ballots.content, method: ballots.method, updatedAt: ballots.updatedAt })
    .from(ballots)
    .where(and(eq(ballots.competitionId, competitionId), where));
  return b ? { content: b.content as BallotContent, method: b.method, updatedAt: b.updatedAt.toISOString() } : null;
}

// ---------- organizer side ----------

/** Codes for this compo's own sheet (they vote in this compo only). */
export async function generateVoteCodes(competitionId: string, n: number): Promise<string[]> {
  const c = await loadCompetition(competitionId);
  return issueVoteCodes({ eventId: c.eventId, competitionIds: [c.id], n, partyWide: false });
}

/** Every code that votes in this compo, its own and the party-wide ones, with the compos each votes in. */
export async function voteCodesOf(competitionId: string) {
  return (await codesOfCompetition(competitionId)).map((l) => ({ ...l, redeemedAt: l.compos.find((x) => x.id === competitionId)?.redeemedAt ?? null }));
}

/** The audience ballots in the shape the tallies and the recount file take, oldest first. */
export async function ballotsForCount(competitionId: string, method: BallotMethod): Promise<{ id: string; content: BallotContent }[]> {
  const rows = await db().select({ id: ballots.id, content: ballots.content, createdAt: ballots.createdAt }).from(ballots).where(eq(ballots.competitionId, competitionId)).orderBy(ballots.createdAt, ballots.id);
  const kind = ballotKind(method);
  // A ballot cast under another kind of method (the organizer switched points ↔ ranked) cannot be counted.
  return rows
    .filter((r) => (kind === "points" ? "points" in (r.content as object) : "ranking" in (r.content as object)))
    .map((r) => ({ id: r.id, content: r.content as BallotContent }));
}

export interface AudienceTallyRow {
  candidate: string;
  score: number | null;
  place: number;
  tied: boolean;
}

export function tallyFor(method: BallotMethod, contents: readonly BallotContent[], candidates: readonly string[]): { ranking: AudienceTallyRow[]; rejected: number } {
  const t = method === "points" ? tallyPoints(contents, candidates) : method === "borda" ? tallyBorda(contents, candidates) : tallySchulze(contents, candidates);
  return { ranking: t.ranking.map(({ candidate, score, place, tied }) => ({ candidate, score, place, tied })), rejected: t.rejected.length };
}

export interface LiveCount {
  status: WindowStatus;
  ballots: number;
  byAccounts: number;
  byCodes: number;
  changes: number;
  codesIssued: number;
  codesRedeemed: number;
  standings: (AudienceTallyRow & { title: string })[];
}

/** The live count: for the organizer's eyes only (the route checks the role). */
export async function liveCount(competitionId: string, now = new Date()): Promise<LiveCount> {
  const c = await loadCompetition(competitionId);
  const [b] = await db()
    .select({ total: count(), byCodes: count(ballots.voteCodeId) })
    .from(ballots)
    .where(eq(ballots.competitionId, c.id));
  const [h] = await db()
    .select({ n: count() })
    .from(ballotHistory)
    .innerJoin(ballots, eq(ballots.id, ballotHistory.ballotId))
    .where(eq(ballots.competitionId, c.id));
  const codes = await codeCounts(c.id);
  const entriesList = await eligibleEntries(c.id);
  const titles = new Map(entriesList.map((e) => [e.id, e.title]));
  const counted = await ballotsForCount(c.id, c.ballotMethod);
  const tally = tallyFor(c.ballotMethod, counted.map((x) => x.content), entriesList.map((e) => e.id));
  return {
    status: windowStatus(c, now),
    ballots: b.total,
    byAccounts: b.total - b.byCodes,
    byCodes: b.byCodes,
    changes: Math.max(0, h.n - b.total),
    codesIssued: codes.issued,
    codesRedeemed: codes.redeemed,
    standings: tally.ranking.map((r) => ({ ...r, title: titles.get(r.candidate) ?? r.candidate })),
  };
}

