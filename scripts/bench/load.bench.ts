// Load on loopback with autocannon, beside a bare React Router page measured in the same run (ratios), then a
// row count: no score or ballot lost or duplicated. Starts its own PostgreSQL, S3 fake, build and web server.
// Run alone: npx tsx scripts/bench/load.bench.ts
import { spawnSync } from "node:child_process";
import { mkdtempSync, rmSync } from "node:fs";
import { tmpdir } from "node:os";
import { join, resolve } from "node:path";
import autocannon from "autocannon";
import { clusterFor, createDatabase, initCluster, startCluster, stopCluster } from "../lib/postgres";
import { applyMigrations } from "../lib/migrate";
import { freePort } from "../lib/ports";
import { localSecrets } from "../lib/secrets";
import { appEnv, startStack } from "../lib/stack";
import { describe, fireAll, judgesAutosave, type TimedRequest } from "./mixed-burst";

type Result = autocannon.Result;

/** Status counts and one sample body per status, gathered by each request's onResponse. */
const seen: Record<string, Record<number, number>> = {};
const samples: Record<string, Record<number, string>> = {};
function tally(name: string) {
  seen[name] = {};
  samples[name] = {};
  return (status: number, body: string) => {
    seen[name][status] = (seen[name][status] ?? 0) + 1;
    samples[name][status] ??= body.slice(0, 200);
  };
}

function summary(r: Result) {
  return { rps: r.requests.average, p50: r.latency.p50, p90: r.latency.p90, p99: r.latency.p99, total: r["2xx"] + r.non2xx, errors: r.errors, timeouts: r.timeouts };
}

function print(name: string, r: Result, ref: Result) {
  const s = summary(r);
  const b = summary(ref);
  const ratio = (x: number, y: number) => (y > 0 ? (x / y).toFixed(2) : "n/a");
  console.log(
    `${name.padEnd(34)} ${s.rps.toFixed(0).padStart(6)} req/s (×${ratio(s.rps, b.rps)} of bare)  p50 ${s.p50} ms (×${ratio(s.p50, b.p50)})  p90 ${s.p90} ms  p99 ${s.p99} ms (×${ratio(s.p99, b.p99)})  requests ${s.total}  statuses ${JSON.stringify(seen[name] ?? {})}  errors ${s.errors}  timeouts ${s.timeouts}`,
  );
}

/** Every response's latency in ms, per result (autocannon's own summary has p90 and p97.5 but no p95). */
const latencies = new WeakMap<Result, number[]>();

function cannon(opts: autocannon.Options): Promise<Result> {
  const times: number[] = [];
  return new Promise((resolve, reject) => {
    const instance = autocannon(opts, (err, res) => {
      if (err) return reject(err);
      latencies.set(res, times);
      resolve(res);
    });
    instance.on("response", (_client: unknown, _status: number, _bytes: number, ms: number) => times.push(ms));
  });
}

/** The 95th percentile of a run's response times (nearest rank), in ms. */
function p95(r: Result): string {
  const t = [...(latencies.get(r) ?? [])].sort((a, b) => a - b);
  return t.length ? t[Math.min(t.length - 1, Math.ceil(0.95 * t.length) - 1)].toFixed(1) : "n/a";
}

export async function benchLoad(): Promise<void> {
  const root = mkdtempSync(join(tmpdir(), "gatecrash-load-"));
  spawnSync("chmod", ["755", root]);
  const cluster = clusterFor(join(root, "pg"), await freePort());
  initCluster(cluster);
  startCluster(cluster);
  let stack: { stop(): Promise<void> } | undefined;
  const cleanups: (() => void)[] = [];
  try {
    createDatabase(cluster, "gatecrash_load");
    const databaseUrl = cluster.url("gatecrash_load");
    await applyMigrations(databaseUrl);
    const ports = { web: await freePort(), s3: await freePort(), smtp: await freePort(), mailWeb: await freePort(), payments: await freePort() };
    // The server build resolves its packages from node_modules, so it lives inside the repository.
    const buildDir = resolve(".gatecrash", `load-build-${process.pid}`);
    cleanups.push(() => rmSync(buildDir, { recursive: true, force: true }));
    const env: NodeJS.ProcessEnv = { ...appEnv(ports, databaseUrl, join(root, "data")), ...localSecrets(), NODE_ENV: "production", GATECRASH_BUILD_DIR: buildDir };
    const built = spawnSync(process.execPath, ["node_modules/@react-router/dev/bin.js", "build"], { env, stdio: "ignore" });
    if (built.status !== 0) throw new Error("build failed");
    stack = await startStack({ ports, dataDir: join(root, "data"), env, services: ["s3", "web"], quiet: true });
    Object.assign(process.env, env);

    // Fixtures, made through the app's own modules against this stack's database.
    const { makeCompo } = await import("../../tests/integration/showcase.fixtures");
    const { grantEventRole, makeUser, sessionCookie } = await import("../../tests/support/users");
    const { db, closeDb } = await import("../../app/db/client.server");
    const schema = await import("../../app/db/schema");
    const { generateVoteCodes } = await import("../../app/voting/voting.server");
    const { eq, inArray, sql } = await import("drizzle-orm");

    const ENTRIES = 20;
    const compo = await makeCompo({ state: "judging", method: "borda", entryCount: ENTRIES });
    const base = `http://127.0.0.1:${ports.web}`;
    const origin = base;
    const showcase = `/e/${compo.event.slug}/${compo.slug}/showcase`;
    const bare = "/check-your-mail";

    const duration = Number(process.env.LOAD_SECONDS ?? 8);
    // Bare page and showcase in turn, twice each, the better run of each counted: other work on a shared machine
    // then weighs on both alike.
    const bareRun = await cannon({ url: base + bare, connections: 20, duration });
    const showcaseRun1 = await cannon({ url: base + showcase, connections: 20, duration });
    // Browsers coming back to the showcase they hold: the ETag it was served with, answered 304 while it is current.
    const etag = (await fetch(base + showcase)).headers.get("etag");
    const revisitRun = etag
      ? await cannon({ url: base + showcase, connections: 20, duration, headers: { "if-none-match": etag }, requests: [{ method: "GET", onResponse: ((t) => (status: number, body: string) => t(status, body))(tally("showcase revisited (304)")) }] })
      : null;
    const bareRun2 = await cannon({ url: base + bare, connections: 20, duration });
    const showcaseRun2 = await cannon({ url: base + showcase, connections: 20, duration });
    const showcaseRun = showcaseRun1.requests.average >= showcaseRun2.requests.average ? showcaseRun1 : showcaseRun2;
    const ref = bareRun.requests.average >= bareRun2.requests.average ? bareRun : bareRun2;
    console.log(`bare React Router page ${bare}: ${ref.requests.average.toFixed(0)} req/s, p50 ${ref.latency.p50} ms, p95 ${p95(ref)} ms, p99 ${ref.latency.p99} ms (the better of two runs, taken in turn with the showcase's two)`);
    print("showcase page", showcaseRun, ref);
    if (revisitRun) print("showcase revisited (304)", revisitRun, ref);
    else console.log("showcase revisited: the showcase had no ETag");
    console.log(`showcase: ×${(showcaseRun.requests.average / ref.requests.average).toFixed(2)} of the bare page's requests per second (goal ≥ 0.5), p95 ${p95(showcaseRun)} ms`);
    if (process.env.LOAD_PARTS === "showcase") {
      await closeDb();
      return;
    }

    // 50 judges, each saving every cell of the grid once (version 0), all at the same time.
    const JUDGES = 50;
    const judges = [] as { id: string; cookie: string }[];
    for (let i = 0; i < JUDGES; i++) {
      const j = await makeUser({ name: `Load Judge ${i}` });
      await grantEventRole(compo.event.id, j.id, "judge");
      await db().insert(schema.juryAssignments).values({ competitionId: compo.competitionId, judgeUserId: j.id });
      judges.push({ id: j.id, cookie: await sessionCookie(j) });
    }
    const cells = compo.entries.flatMap((e) => compo.criteria.map((c) => ({ entryId: e.id, criterionId: c.id })));
    // Round robin over the judges: at any moment the 50 connections carry 50 different judges' saves.
    const saves = cells.flatMap((cell) => judges.map((j, k) => ({ cookie: j.cookie, body: JSON.stringify({ ...cell, value: k % 11, version: 0 }) })));
    let nextSave = 0;
    const scoresPath = `/api/judging/${compo.competitionId}/scores`;
    const scoreRun = await cannon({
      url: base + scoresPath,
      connections: JUDGES,
      amount: saves.length,
      headers: { "content-type": "application/json", origin },
      requests: [
        {
          method: "POST",
          onResponse: ((t) => (status: number, body: string) => t(status, body))(tally("judges' autosave")),
          setupRequest: (req) => {
            const s = saves[nextSave++ % saves.length];
            return { ...req, headers: { ...req.headers, "content-type": "application/json", origin, cookie: s.cookie }, body: s.body };
          },
        },
      ],
    });

    // A burst of 2,000 ballots, each with its own vote code.
    const BALLOTS = 2000;
    const codes: string[] = [];
    while (codes.length < BALLOTS) codes.push(...(await generateVoteCodes(compo.competitionId, Math.min(500, BALLOTS - codes.length))));
    const ranking = compo.entries.map((e) => e.id);
    let nextCode = 0;
    const ballotRun = await cannon({
      url: `${base}/api/ballots/${compo.competitionId}`,
      connections: 100,
      amount: BALLOTS,
      // A ballot that waits its turn is still answered (200, or 503 with Retry-After); only a hang should time out.
      timeout: 60,
      headers: { "content-type": "application/json", origin },
      requests: [
        {
          method: "POST",
          onResponse: ((t) => (status: number, body: string) => t(status, body))(tally("ballot burst")),
          setupRequest: (req) => ({ ...req, body: JSON.stringify({ code: codes[nextCode++ % BALLOTS], ballot: { ranking } }) }),
        },
      ],
    });

    print("judges' autosave", scoreRun, ref);
    print("ballot burst", ballotRun, ref);
    for (const [name, bySt] of Object.entries(samples)) for (const [st, body] of Object.entries(bySt)) if (Number(st) >= 300 && Number(st) !== 304) console.log(`  ${name} ${st}: ${body}`);

    // Count rows: every save and every ballot exactly once.
    const judgeIds = judges.map((j) => j.id);
    const [{ n: scoreRows }] = await db()
      .select({ n: sql<number>`count(*)::int` })
      .from(schema.scores)
      .innerJoin(schema.scoresheets, eq(schema.scoresheets.id, schema.scores.scoresheetId))
      .where(inArray(schema.scoresheets.judgeUserId, judgeIds));
    const [{ n: distinctCells }] = await db()
      .select({ n: sql<number>`count(distinct (${schema.scoresheets.judgeUserId}, ${schema.scoresheets.entryId}, ${schema.scores.criterionId}))::int` })
      .from(schema.scores)
      .innerJoin(schema.scoresheets, eq(schema.scoresheets.id, schema.scores.scoresheetId))
      .where(inArray(schema.scoresheets.judgeUserId, judgeIds));
    const [{ n: ballotRows, codesUsed }] = await db()
      .select({ n: sql<number>`count(*)::int`, codesUsed: sql<number>`count(distinct ${schema.ballots.voteCodeId})::int` })
      .from(schema.ballots)
      .where(eq(schema.ballots.competitionId, compo.competitionId));
    const okScores = scoreRun["2xx"];
    const okBallots = ballotRun["2xx"];
    const expectedScores = saves.length;
    console.log(`scores: ${okScores} saves answered 2xx of ${expectedScores} sent; ${scoreRows} rows, ${distinctCells} distinct cells → ${scoreRows === okScores && distinctCells === scoreRows ? "none lost or duplicated" : "MISMATCH"}`);
    console.log(`ballots: ${okBallots} answered 2xx of ${BALLOTS}; ${ballotRows} rows, ${codesUsed} distinct codes → ${ballotRows === okBallots && codesUsed === ballotRows ? "none lost or duplicated" : "MISMATCH"}`);
    const mixedOk = await mixedBurst({ base, makeCompo, makeUser, grantEventRole, sessionCookie, generateVoteCodes, db, schema, sql });
    await closeDb();
    if (!mixedOk) process.exitCode = 1;
    if (scoreRows !== okScores || distinctCells !== scoreRows || ballotRows !== okBallots || codesUsed !== ballotRows) process.exitCode = 1;
  } finally {
    await stack?.stop();
    stopCluster(cluster);
    rmSync(root, { recursive: true, force: true });
    for (const c of cleanups) c();
  }
}

/**
 * 500 mixed ballot requests at once (200 fresh codes, 50 of those codes again from other browsers, 100 wrong codes,
 * 100 verified accounts of which 50 cast twice) while 50 judges autosave 20 cells each; the same number of bare-page
 * requests at once is the reference. Afterwards: a page in under a second, and exactly one ballot per code and per
 * account in the database. Returns whether all of that held.
 */
async function mixedBurst(x: {
  base: string;
  makeCompo: typeof import("../../tests/integration/showcase.fixtures").makeCompo;
  makeUser: typeof import("../../tests/support/users").makeUser;
  grantEventRole: typeof import("../../tests/support/users").grantEventRole;
  sessionCookie: typeof import("../../tests/support/users").sessionCookie;
  generateVoteCodes: typeof import("../../app/voting/voting.server").generateVoteCodes;
  db: typeof import("../../app/db/client.server").db;
  schema: typeof import("../../app/db/schema");
  sql: typeof import("drizzle-orm").sql;
}): Promise<boolean> {
  const { base, db, schema, sql } = x;
  const compo = await x.makeCompo({ state: "judging", method: "borda", entryCount: 20 });
  const ranking = compo.entries.map((e) => e.id);
  const codes = await x.generateVoteCodes(compo.competitionId, 200);
  const accounts: string[] = [];
  for (let i = 0; i < 100; i++) accounts.push(await x.sessionCookie(await x.makeUser({ name: `Voter ${i}` })));
  const judges: { cookie: string; cells: { entryId: string; criterionId: string; value: number }[] }[] = [];
  for (let i = 0; i < 50; i++) {
    const j = await x.makeUser({ name: `Burst Judge ${i}` });
    await x.grantEventRole(compo.event.id, j.id, "judge");
    await db().insert(schema.juryAssignments).values({ competitionId: compo.competitionId, judgeUserId: j.id });
    const cells = compo.entries.slice(0, 10).flatMap((e) => compo.criteria.slice(0, 2).map((c) => ({ entryId: e.id, criterionId: c.id, value: (i + e.title.length) % 11 })));
    judges.push({ cookie: await x.sessionCookie(j), cells });
  }
  const url = `${base}/api/ballots/${compo.competitionId}`;
  const put = (kind: string, body: unknown, cookie?: string): TimedRequest & { cookie?: string } => ({
    url,
    kind,
    cookie,
    init: { method: "PUT", headers: { "content-type": "application/json", origin: base, ...(cookie ? { cookie } : {}) }, body: JSON.stringify(body) },
  });
  const requests: (TimedRequest & { cookie?: string })[] = [
    ...codes.map((code) => put("fresh code", { code, ballot: { ranking } })),
    ...codes.slice(0, 50).map((code) => put("reused code", { code, ballot: { ranking: [...ranking].reverse() } })),
    ...Array.from({ length: 100 }, (_, i) => put("wrong code", { code: `WXYZ-${"ABCDEFGH"[i % 8]}${"JKMNPQRS"[(i >> 3) % 8]}${"TUVW"[(i >> 6) % 4]}Z`, ballot: { ranking } })),
    ...accounts.map((cookie) => put("account", { ballot: { ranking } }, cookie)),
    ...accounts.slice(0, 50).map((cookie) => put("account again", { ballot: { ranking: [...ranking].reverse() } }, cookie)),
  ].sort(() => Math.random() - 0.5);

  const bareRef = await fireAll(Array.from({ length: requests.length }, () => ({ url: `${base}/check-your-mail`, init: {}, kind: "bare page" })));
  const [burst, saves] = await Promise.all([fireAll(requests), judgesAutosave(`${base}/api/judging/${compo.competitionId}/scores`, base, judges)]);
  const t0 = performance.now();
  const after = await fetch(`${base}/check-your-mail`, { signal: AbortSignal.timeout(30_000) });
  await after.arrayBuffer();
  const afterMs = performance.now() - t0;

  console.log(describe("bare page, 500 at once", bareRef));
  console.log(describe("mixed ballot burst, 500 at once", burst, bareRef));
  console.log(describe("50 judges autosaving meanwhile", saves, bareRef));
  console.log(`a page right after the burst: ${after.status} in ${afterMs.toFixed(0)} ms (${afterMs < 1000 ? "under a second" : "TOO SLOW"})`);

  const [dupCodes] = (await db().execute(sql`select count(*)::int as n from (select vote_code_id from ${schema.ballots} where competition_id = ${compo.competitionId} and vote_code_id is not null group by vote_code_id having count(*) > 1) d`)) as unknown as { n: number }[];
  const [dupAccounts] = (await db().execute(sql`select count(*)::int as n from (select voter_user_id from ${schema.ballots} where competition_id = ${compo.competitionId} and voter_user_id is not null group by voter_user_id having count(*) > 1) d`)) as unknown as { n: number }[];
  const [byCode] = (await db().execute(sql`select count(*)::int as n from ${schema.ballots} where competition_id = ${compo.competitionId} and vote_code_id is not null`)) as unknown as { n: number }[];
  const [byAccount] = (await db().execute(sql`select count(*)::int as n from ${schema.ballots} where competition_id = ${compo.competitionId} and voter_user_id is not null`)) as unknown as { n: number }[];
  const [redeemed] = (await db().execute(sql`select count(*)::int as n from ${schema.voteCodes} where competition_id = ${compo.competitionId} and redeemed_at is not null`)) as unknown as { n: number }[];
  const freshOk = burst.statuses["fresh code"]?.["200"] ?? 0;
  const reusedOk = burst.statuses["reused code"]?.["200"] ?? 0;
  const accountsOk = new Set(requests.flatMap((r, i) => ((r as { cookie?: string }).cookie && burst.each[i] === "200" ? [(r as { cookie?: string }).cookie] : [])));
  console.log(
    `ballots: ${byCode.n} by code (${redeemed.n} codes redeemed; ${freshOk} fresh + ${reusedOk} reused sends answered 200), ${byAccount.n} by account (${accountsOk.size} of 100 accounts had a cast answered 200); codes with two ballots: ${dupCodes.n}, accounts with two: ${dupAccounts.n}`,
  );
  const [sheetRows] = (await db().execute(sql`select count(*)::int as n from ${schema.scores} s join ${schema.scoresheets} h on h.id = s.scoresheet_id join ${schema.entries} e on e.id = h.entry_id where e.competition_id = ${compo.competitionId}`)) as unknown as { n: number }[];
  const savedOk = saves.statuses.autosave["200"] ?? 0;
  console.log(`scores: ${savedOk} autosaves answered 200, ${sheetRows.n} score rows (${sheetRows.n === savedOk ? "none lost or duplicated" : "MISMATCH"})`);
  return (
    burst.noAnswer === 0 &&
    saves.noAnswer === 0 &&
    after.status === 200 &&
    afterMs < 1000 &&
    dupCodes.n === 0 &&
    dupAccounts.n === 0 &&
    byCode.n === redeemed.n &&
    byCode.n === freshOk + reusedOk &&
    byAccount.n === accountsOk.size &&
    sheetRows.n === savedOk
  );
}

if (import.meta.url === `file://${process.argv[1]}`) await benchLoad();
