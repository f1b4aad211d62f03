import { and, eq } from "drizzle-orm";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { closeDb, db } from "~/db/client.server";
import { ballots, voteCodes } from "~/db/schema";
import { stopQueue } from "~/jobs/queue.server";
import { generateCode } from "~/voting/codes";
import { generateVoteCodes } from "~/voting/voting.server";
import { listenBuilt } from "../security/listener";
import { makeCompo } from "./showcase.fixtures";

/**
 * A burst of concurrent ballots against the built server on a real port and the real database: every request gets
 * an answer (none waits forever for a pool connection held by another transaction), the app serves a page
 * afterwards, and the database holds exactly one ballot for the code that was sent 200 times.
 * Before the transaction handles were passed down, the ballot transaction asked the pool for a second connection
 * (the rate-limit hit) while holding the first; ten such requests filled the pool of ten and nothing answered again.
 */
let server: Awaited<ReturnType<typeof listenBuilt>>;
let base: string;

beforeAll(async () => {
  server = await listenBuilt();
  base = server.base;
}, 120_000);

afterAll(async () => {
  await server.close();
  await stopQueue();
  await closeDb();
});

const BURST = 200;
/** Each request's own deadline: far beyond what one ballot takes, so only a hang reaches it. */
const DEADLINE_MS = 30_000;

async function burst(url: string, bodies: string[]): Promise<(number | "no answer")[]> {
  return Promise.all(
    bodies.map((body) =>
      fetch(url, { method: "PUT", headers: { "content-type": "application/json", origin: base }, body, signal: AbortSignal.timeout(DEADLINE_MS) }).then(
        async (r) => (await r.arrayBuffer(), r.status),
        () => "no answer" as const,
      ),
    ),
  );
}

function counts(statuses: (number | string)[]): Record<string, number> {
  const out: Record<string, number> = {};
  for (const s of statuses) out[s] = (out[s] ?? 0) + 1;
  return out;
}

describe("a burst of 200 concurrent ballots", () => {
  it("answers every one, with one valid code redeemed once, and the app keeps serving", async () => {
    const f = await makeCompo({ method: "borda" });
    const [code] = await generateVoteCodes(f.competitionId, 1);
    const ranking = f.entries.map((e) => e.id);
    const url = `${base}/api/ballots/${f.competitionId}`;
    const statuses = await burst(url, Array.from({ length: BURST }, () => JSON.stringify({ code, ballot: { ranking } })));
    const seen = counts(statuses);
    expect(seen["no answer"] ?? 0, JSON.stringify(seen)).toBe(0);
    // One redemption; every other request is told the code is used, or to slow down.
    expect(seen["200"], JSON.stringify(seen)).toBe(1);
    expect(statuses.every((s) => s === 200 || s === 409 || s === 429 || s === 503), JSON.stringify(seen)).toBe(true);
    const [c] = await db().select().from(voteCodes).where(eq(voteCodes.code, code));
    expect(await db().select().from(ballots).where(and(eq(ballots.competitionId, f.competitionId), eq(ballots.voteCodeId, c.id)))).toHaveLength(1);

    const page = await fetch(`${base}/check-your-mail`, { signal: AbortSignal.timeout(DEADLINE_MS) });
    expect(page.status).toBe(200);
  }, 120_000);

  it("answers 200 wrong codes, storing nothing, and the app keeps serving", async () => {
    const f = await makeCompo({ method: "borda" });
    const ranking = f.entries.map((e) => e.id);
    const url = `${base}/api/ballots/${f.competitionId}`;
    const statuses = await burst(url, Array.from({ length: BURST }, () => JSON.stringify({ code: generateCode(), ballot: { ranking } })));
    const seen = counts(statuses);
    expect(seen["no answer"] ?? 0, JSON.stringify(seen)).toBe(0);
    expect(statuses.every((s) => s === 404 || s === 429 || s === 503), JSON.stringify(seen)).toBe(true);
    expect(await db().select().from(ballots).where(eq(ballots.competitionId, f.competitionId))).toHaveLength(0);
    const page = await fetch(`${base}/check-your-mail`, { signal: AbortSignal.timeout(DEADLINE_MS) });
    expect(page.status).toBe(200);
  }, 120_000);
});
