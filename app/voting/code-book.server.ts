import { and, asc, count, eq, inArray, isNull, sql } from "drizzle-orm";
import { AppError } from "~/errors/app-error";
import { db, type Db } from "~/db/client.server";
import { competitions, voteCodes, voteCodeScopes } from "~/db/schema";
import { generateCode } from "./codes";

/**
 * The vote-code book: which slips exist and which compos each votes in. A compo's own sheet gives codes with one
 * scope; a party-wide sheet gives codes that vote in several compos of the party, once in each.
 */
export const MAX_CODES_PER_BATCH = 500;

/** A refused code sheet (an AppError about the request as a whole). */
export class CodeBookError extends AppError {
  constructor(message: string) {
    super(409, "code_book_refused", message);
    this.name = "CodeBookError";
  }
}

/** Makes n fresh codes that vote in the given compos (all of one party). */
export async function issueVoteCodes(opts: { eventId: string; competitionIds: string[]; n: number; partyWide: boolean }): Promise<string[]> {
  const { eventId, n } = opts;
  if (!Number.isInteger(n) || n < 1 || n > MAX_CODES_PER_BATCH) throw new RangeError(`between 1 and ${MAX_CODES_PER_BATCH} codes at a time`);
  const ids = [...new Set(opts.competitionIds)];
  if (ids.length === 0) throw new CodeBookError("Choose at least one compo the codes vote in.");
  const own = await db().select({ id: competitions.id }).from(competitions).where(and(eq(competitions.eventId, eventId), inArray(competitions.id, ids)));
  if (own.length !== ids.length) throw new CodeBookError("Every compo of a code sheet must belong to this party.");
  return db().transaction(async (tx) => {
    const made: { id: string; code: string }[] = [];
    while (made.length < n) {
      const batch = [...new Set(Array.from({ length: n - made.length }, generateCode))];
      const rows = await tx
        .insert(voteCodes)
        .values(batch.map((code) => ({ eventId, code, partyWide: opts.partyWide })))
        .onConflictDoNothing({ target: voteCodes.code })
        .returning({ id: voteCodes.id, code: voteCodes.code });
      made.push(...rows);
    }
    await tx.insert(voteCodeScopes).values(made.flatMap((m) => ids.map((competitionId) => ({ voteCodeId: m.id, competitionId }))));
    return made.map((m) => m.code);
  });
}

export interface CodeLine {
  code: string;
  createdAt: string;
  partyWide: boolean;
  /** Every compo this code votes in, in the party's order, with the moment it was used there. */
  compos: { id: string; title: string; slug: string; redeemedAt: string | null }[];
}

async function linesFor(where: ReturnType<typeof eq>): Promise<CodeLine[]> {
  const rows = await db()
    .select({
      id: voteCodes.id,
      code: voteCodes.code,
      createdAt: voteCodes.createdAt,
      partyWide: voteCodes.partyWide,
      competitionId: competitions.id,
      title: competitions.title,
      slug: competitions.slug,
      redeemedAt: voteCodeScopes.redeemedAt,
    })
    .from(voteCodes)
    .innerJoin(voteCodeScopes, eq(voteCodeScopes.voteCodeId, voteCodes.id))
    .innerJoin(competitions, eq(competitions.id, voteCodeScopes.competitionId))
    .where(where)
    .orderBy(asc(voteCodes.createdAt), asc(voteCodes.code), asc(competitions.createdAt), asc(competitions.title));
  const byCode = new Map<string, CodeLine>();
  for (const r of rows) {
    const line = byCode.get(r.id) ?? { code: r.code, createdAt: r.createdAt.toISOString(), partyWide: r.partyWide, compos: [] };
    line.compos.push({ id: r.competitionId, title: r.title, slug: r.slug, redeemedAt: r.redeemedAt?.toISOString() ?? null });
    byCode.set(r.id, line);
  }
  return [...byCode.values()];
}

/** Every code that votes in this compo (its own and the party-wide ones), with all the compos each votes in. */
export async function codesOfCompetition(competitionId: string): Promise<CodeLine[]> {
  const inCompo = db().select({ id: voteCodeScopes.voteCodeId }).from(voteCodeScopes).where(eq(voteCodeScopes.competitionId, competitionId));
  return linesFor(inArray(voteCodes.id, inCompo) as ReturnType<typeof eq>);
}

/** The party-wide codes of a party. */
export async function partyCodes(eventId: string): Promise<CodeLine[]> {
  return linesFor(and(eq(voteCodes.eventId, eventId), eq(voteCodes.partyWide, true)) as ReturnType<typeof eq>);
}

/** A slip worth handing out: used nowhere yet. */
export const unused = (l: CodeLine) => l.compos.every((c) => c.redeemedAt === null);

export type Redemption = { kind: "redeemed"; codeId: string; redeemedAt: Date } | { kind: "used" } | { kind: "unknown" };

type Tx = Parameters<Parameters<Db["transaction"]>[0]>[0];

/** Redeems a code for one compo inside the caller's transaction: once per compo, never for a compo outside its scope. */
export async function redeemCode(tx: Tx, competitionId: string, normalisedCode: string, now: Date): Promise<Redemption> {
  const ofCode = tx.select({ id: voteCodes.id }).from(voteCodes).where(eq(voteCodes.code, normalisedCode));
  const [redeemed] = await tx
    .update(voteCodeScopes)
    .set({ redeemedAt: now })
    .where(and(eq(voteCodeScopes.competitionId, competitionId), inArray(voteCodeScopes.voteCodeId, ofCode), isNull(voteCodeScopes.redeemedAt)))
    .returning({ codeId: voteCodeScopes.voteCodeId, redeemedAt: voteCodeScopes.redeemedAt });
  if (redeemed) return { kind: "redeemed", codeId: redeemed.codeId, redeemedAt: redeemed.redeemedAt! };
  const [exists] = await tx
    .select({ id: voteCodeScopes.voteCodeId })
    .from(voteCodeScopes)
    .where(and(eq(voteCodeScopes.competitionId, competitionId), inArray(voteCodeScopes.voteCodeId, ofCode)));
  return exists ? { kind: "used" } : { kind: "unknown" };
}

/** When this code was redeemed in this compo (null when it was not, or does not vote here). */
export async function redeemedAtIn(codeId: string, competitionId: string): Promise<Date | null> {
  const [row] = await db()
    .select({ redeemedAt: voteCodeScopes.redeemedAt })
    .from(voteCodeScopes)
    .where(and(eq(voteCodeScopes.voteCodeId, codeId), eq(voteCodeScopes.competitionId, competitionId)));
  return row?.redeemedAt ?? null;
}

export async function codeCounts(competitionId: string): Promise<{ issued: number; redeemed: number }> {
  const [row] = await db()
    .select({ issued: count(), redeemed: count(voteCodeScopes.redeemedAt) })
    .from(voteCodeScopes)
    .where(eq(voteCodeScopes.competitionId, competitionId));
  return { issued: row.issued, redeemed: row.redeemed };
}

/** The compos a party-wide sheet may cover: every compo of the party that is past draft. */
export async function votableCompos(eventId: string) {
  return db()
    .select({ id: competitions.id, title: competitions.title, slug: competitions.slug, state: competitions.state, votingOpensAt: competitions.votingOpensAt, votingClosesAt: competitions.votingClosesAt })
    .from(competitions)
    .where(and(eq(competitions.eventId, eventId), sql`${competitions.state} <> 'draft'`))
    .orderBy(asc(competitions.createdAt), asc(competitions.title));
}
