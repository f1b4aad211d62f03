import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { closeDb, db } from "~/db/client.server";
import { conflicts, juryAssignments } from "~/db/schema";
import { stopQueue } from "~/jobs/queue.server";
import routeConfig from "~/routes";
import { addCheckRun, makeCompo, type CompoFixture } from "./showcase.fixtures";
import { callRoute } from "../support/routes";
import { grantEventRole, makeUser, request, sessionCookie } from "../support/users";

/**
 * The authorization matrix, generated from the route configuration: every route module's loader and action,
 * called as each role with ids of event A's objects, against the expected outcome in TABLE. A route without a row
 * fails ("add a row for …"). Then cross-tenant calls: event B's ids inside event A's URLs and bodies are refused,
 * never "found".
 *
 * Roles, in the order of every row: anonymous, audience (signed in, no role), entrant of the entry's crew, entrant
 * of another crew, judge (on the jury), conflicted judge (on the jury, conflict with the entry), judge of another
 * event, organizer of another event, organizer, platform admin.
 * Letters: A = allowed (a loader answers < 400; an action is not refused: no 401/403/404, no sign-in redirect),
 *          S = sent to sign in (a redirect to /sign-in, or 401 from a JSON route), N = 404 (not found: the answer
 *          never confirms that the object exists), F = 403 (forbidden: on pages that name no object, or an action
 *          on an object the same role may already see),
 *          . = not asserted (said why in the row's note).
 * "Never confirm existence": a route whose URL names an object may not answer 403 to anyone, and a made-up id
 * must get exactly the answer a real id of someone else's gets (the last test).
 */
const ROLES = ["anonymous", "audience", "crew", "otherCrew", "judge", "conflictedJudge", "otherJudge", "otherOrganizer", "organizer", "admin"] as const;
type Role = (typeof ROLES)[number];
interface Row {
  loader?: string;
  action?: string;
  note?: string;
  /** A well-formed JSON body for the action probe, for routes that validate the body before the access check. */
  body?: unknown;
}

const PUBLIC = "AAAAAAAAAA";
const SIGNED_IN = "SAAAAAAAAA";
const ORGANIZER = "SNNNNNNNAA";
const NOBODY = "NNNNNNNNNN";
const CREW_ONLY = "SNANNNNNNN";

const TABLE: Record<string, Row> = {
  "/": { loader: PUBLIC },
  "sign-in": { loader: PUBLIC, action: PUBLIC },
  "sign-up": { loader: PUBLIC, action: PUBLIC },
  "sign-out": { loader: PUBLIC, action: "..........", note: "signing out ends the caller's session, which the rest of the matrix needs; tested in the accounts suite" },
  "check-your-mail": { loader: PUBLIC },
  welcome: { loader: SIGNED_IN },
  "forgot-password": { loader: PUBLIC, action: PUBLIC },
  "reset-password": { loader: PUBLIC, action: PUBLIC },
  events: { loader: PUBLIC },
  "my/entries": { loader: SIGNED_IN },
  judging: { loader: "SFFFAAAFFF" },
  organize: { loader: "SFFFFFFAAA" },
  admin: { loader: "SFFFFFFFFA" },
  "api/auth/*": { loader: "..........", action: "..........", note: "better-auth's own handler; its routes are not ours to map" },
  "api/me": { loader: SIGNED_IN },
  "api/checks/:entryId": { loader: "SNANAANNAA" },
  "artifacts/:artifactId": { loader: PUBLIC, note: "the compo is in judging: its counting uploads' reference captures are on the public showcase" },
  "organize/events/new": { loader: SIGNED_IN, action: SIGNED_IN },
  "organize/events/:eventId": { loader: ORGANIZER, action: ORGANIZER },
  "organize/events/:eventId/competitions/new": { loader: ORGANIZER, action: ORGANIZER },
  "organize/:competitionId": { loader: ORGANIZER, action: ORGANIZER },
  "organize/:competitionId/edit": { loader: ORGANIZER, action: ORGANIZER },
  "organize/:competitionId/ruleset.json": { loader: ORGANIZER },
  "organize/:competitionId/entries": { loader: ORGANIZER, action: ORGANIZER },
  "organize/:competitionId/files/:fileId": { loader: ORGANIZER },
  "e/:eventSlug/:competitionSlug": { loader: PUBLIC },
  "e/:eventSlug/:competitionSlug/calendar.ics": { loader: PUBLIC },
  "e/:eventSlug/:competitionSlug/ruleset.json": { loader: PUBLIC },
  "e/:eventSlug/:competitionSlug/starter.zip": { loader: PUBLIC },
  "crews/new": { loader: SIGNED_IN, action: SIGNED_IN },
  "crews/:crewId": { loader: CREW_ONLY, action: CREW_ONLY, note: "crew pages are for members only, admins included" },
  "invites/:token": { loader: "..........", action: "..........", note: "the token is the key; a made-up token is a 404 for everyone (tested in the entrant suite)" },
  "e/:eventSlug/:competitionSlug/enter": { loader: "..........", action: "..........", note: "the compo is in judging, so entering is closed for everyone" },
  "entries/:entryId": { loader: "SNANNNNNAA", action: "SNANNNNNAA", note: "the organizer may look and grant a late exception (so a 403 confirms nothing new); only the crew pays, uploads and picks its final upload" },
  "organize/:competitionId/entries/:entryId/refund": { loader: ORGANIZER, action: ORGANIZER },
  "api/payments/webhook": { action: "..........", note: "authenticated by the payment service's signature, not by role" },
  "api/entries/:entryId/uploads": {
    action: CREW_ONLY,
    body: { files: [{ kind: "bundle", filename: "a.zip", size: 100 }] },
    note: "validates the body before the access check (an empty body is a 400 for anyone): probed with a valid one",
  },
  "api/uploads/:uploadId": { loader: CREW_ONLY, action: CREW_ONLY },
  "api/uploads/:uploadId/files": {
    action: CREW_ONLY,
    body: { kind: "layout", filename: "a.gds", size: 100 },
    note: "validates the body before the access check: probed with a valid one",
  },
  "api/uploads/:uploadId/files/:fileId": { loader: CREW_ONLY, action: CREW_ONLY },
  "judging/:competitionId": { loader: "SNNNAANNNN" },
  "judging/:competitionId/entries/:entryId": { loader: "SNNNANNNNN", action: "SNNNANNNNN" },
  "api/judging/:competitionId/scores": { loader: "SNNNAANNNN", action: "SNNNAANNNN" },
  "api/judging/:competitionId/notes": { action: "SNNNAANNNN" },
  "judge-invites/:token": { loader: "..........", action: "..........", note: "the token is the key (tested in the judging suite)" },
  "organize/:competitionId/jury": { loader: ORGANIZER, action: ORGANIZER },
  "organize/:competitionId/standings": { loader: ORGANIZER, action: ORGANIZER },
  "organize/:competitionId/entries/:entryId/history": { loader: ORGANIZER },
  "e/:eventSlug/:competitionSlug/showcase": { loader: PUBLIC },
  "e/:eventSlug/:competitionSlug/entries/:entryId": { loader: PUBLIC },
  "e/:eventSlug/:competitionSlug/entries/:entryId/media/:kind": { loader: "..........", note: "the fixture's artifacts have no bytes in S3" },
  "e/:eventSlug/:competitionSlug/vote": { loader: PUBLIC, action: "..........", note: "an empty ballot is a form error for anyone" },
  "e/:eventSlug/:competitionSlug/results": { loader: PUBLIC, note: "before publication the page says the results are not out yet" },
  "e/:eventSlug/:competitionSlug/results.csv": { loader: NOBODY },
  "e/:eventSlug/:competitionSlug/results.txt": { loader: NOBODY },
  "e/:eventSlug/:competitionSlug/results.json": { loader: NOBODY },
  "e/:eventSlug/:competitionSlug/recount.json": { loader: NOBODY },
  "api/ballots/:competitionId": { loader: PUBLIC, action: "..........", note: "anyone may try with a vote code; tested in the voting suite" },
  "organize/:competitionId/audience": { loader: ORGANIZER, action: ORGANIZER },
  "organize/:competitionId/audience/codes": { loader: ORGANIZER },
  "organize/:competitionId/audience/codes.csv": { loader: ORGANIZER },
  "organize/:competitionId/results": { loader: ORGANIZER, action: ORGANIZER },
  "organize/:competitionId/stage": { loader: ORGANIZER, action: ORGANIZER },
  "stage/:competitionId": { loader: ORGANIZER },
  "e/:eventSlug": { loader: PUBLIC, note: "the party page: public once a compo is past draft" },
  "e/:eventSlug/calendar.ics": { loader: PUBLIC },
  "e/:eventSlug/results.txt": { loader: NOBODY, note: "no compo of the party has published results yet" },
  "e/:eventSlug/results.csv": { loader: NOBODY, note: "no compo of the party has published results yet" },
  "organize/events/:eventId/party": { loader: ORGANIZER, action: ORGANIZER },
  "organize/events/:eventId/party/codes": { loader: ORGANIZER },
  "organize/events/:eventId/party/codes.csv": { loader: ORGANIZER },
  "organize/events/:eventId/archive.zip": { loader: "SNNNNNNN..", note: "the matrix's fixture files are rows without bytes in storage: the organizer gets 409 naming them; the archive itself is tested in the party suite" },
  "organize/events/:eventId/shuttle": { loader: ORGANIZER },
  "organize/events/:eventId/shuttle.zip": { loader: "SNNNNNNN..", note: "with no entry chosen an organizer gets 400 (nothing to export); the export itself is tested in the party suite" },
  "*": { loader: NOBODY, note: "the not-found page is a 404 for everyone" },
};

interface FlatRoute {
  path: string;
  file: string;
  /** A layout route (it has children): it only loads, its index child shares its path and has the action. */
  layout: boolean;
}
function flatten(routes: { path?: string; index?: boolean; file: string; children?: unknown[] }[], prefix = ""): FlatRoute[] {
  return routes.flatMap((r) => {
    const path = r.index ? prefix || "/" : [prefix, r.path].filter(Boolean).join("/");
    const here = { path: path || "/", file: r.file, layout: (r.children ?? []).length > 0 };
    return [here, ...flatten((r.children ?? []) as never, path)];
  });
}
const ALL = flatten(routeConfig as never);

let world: Awaited<ReturnType<typeof makeWorld>>;

async function makeWorld() {
  const a: CompoFixture = await makeCompo({ state: "judging" });
  const b: CompoFixture = await makeCompo({ state: "judging" });
  const entry = a.entries[0];
  const [crewRow] = await db().query.entries.findMany({ where: (e, { eq }) => eq(e.id, entry.id), columns: { crewId: true } });
  const runId = await addCheckRun(entry.uploadId, "pass");
  const [artifact] = await db().query.artifacts.findMany({ where: (x, { eq }) => eq(x.checkRunId, runId) });
  const [file] = await db().query.uploadFiles.findMany({ where: (x, { eq }) => eq(x.uploadId, entry.uploadId) });
  // Bytes behind the rows, so that routes which stream them have something to stream.
  const { putObject } = await import("~/storage/s3.server");
  await putObject(artifact.s3Key, "WEBM", artifact.mediaType);
  await putObject(file.s3Key, "PK", "application/zip");

  const judge = await makeUser({ name: "Matrix Judge" });
  const conflicted = await makeUser({ name: "Conflicted Judge" });
  for (const j of [judge, conflicted]) {
    await grantEventRole(a.event.id, j.id, "judge");
    await db().insert(juryAssignments).values({ competitionId: a.competitionId, judgeUserId: j.id });
  }
  await db().insert(conflicts).values({ entryId: entry.id, judgeUserId: conflicted.id, reason: "same crew as a friend" });
  const otherJudge = await makeUser({ name: "Judge Elsewhere" });
  await grantEventRole(b.event.id, otherJudge.id, "judge");
  await db().insert(juryAssignments).values({ competitionId: b.competitionId, judgeUserId: otherJudge.id });
  const audience = await makeUser({ name: "Audience" });
  const admin = await makeUser({ name: "Admin", admin: true });

  const cookies: Record<Role, string | undefined> = {
    anonymous: undefined,
    audience: await sessionCookie(audience),
    crew: await sessionCookie(entry.member),
    otherCrew: await sessionCookie(a.entries[1].member),
    judge: await sessionCookie(judge),
    conflictedJudge: await sessionCookie(conflicted),
    otherJudge: await sessionCookie(otherJudge),
    otherOrganizer: b.organizerCookie,
    organizer: a.organizerCookie,
    admin: await sessionCookie(admin),
  };
  const params: Record<string, string> = {
    eventId: a.event.id,
    eventSlug: a.event.slug,
    competitionSlug: a.slug,
    competitionId: a.competitionId,
    entryId: entry.id,
    crewId: crewRow.crewId,
    uploadId: entry.uploadId,
    fileId: file.id,
    artifactId: artifact.id,
    token: "no-such-token",
    kind: "webm",
    "*": "no/such/page",
  };
  return { a, b, cookies, params };
}

beforeAll(async () => {
  world = await makeWorld();
}, 120_000);
afterAll(async () => {
  await stopQueue();
  await closeDb();
});

function urlFor(path: string, params: Record<string, string>): string {
  return "/" + path.replace(/^\//, "").replace(/:(\w+)/g, (_, k: string) => params[k]).replace("*", params["*"]);
}

type Verdict = "A" | "S" | "N" | "F" | "?";
function classify(kind: "loader" | "action", status: number, location?: string): Verdict {
  if (status === 401 || (status >= 300 && status < 400 && location?.startsWith("/sign-in"))) return "S";
  if (status === 404) return "N";
  if (status === 403) return "F";
  if (kind === "loader") return status < 400 ? "A" : "?";
  return status < 500 ? "A" : "?";
}
const REFUSED = new Set<Verdict>(["S", "N", "F"]);
const NAMES: Record<string, string> = { A: "allowed", S: "sent to sign in", N: "404", F: "403", "?": "an error" };

async function outcome(fn: unknown, kind: "loader" | "action", url: string, params: Record<string, string>, cookie?: string, body: unknown = {}): Promise<{ status: number; location?: string }> {
  const req =
    kind === "loader"
      ? request(url, { cookie })
      : url.startsWith("/api/")
        ? request(url, { cookie, method: "POST", json: body })
        : request(url, { cookie, method: "POST", form: { intent: "probe" } });
  // A route that throws something other than a response is a server error: recorded, so the row fails with it.
  return callRoute(fn, req, params).catch((e: unknown) => ({ status: 500, location: `thrown ${e instanceof Error ? `${e.name}: ${e.message}` : String(e)}` }));
}

describe("the authorization matrix", () => {
  it("has a row for every route in app/routes.ts", () => {
    const missing = ALL.filter((r) => !TABLE[r.path]).map((r) => `add a row for "${r.path}" (${r.file})`);
    expect(missing).toEqual([]);
  });

  it("never answers 403 on a route whose URL names an object, unless the same role may see that object", () => {
    const named = ALL.filter((r) => /:\w+/.test(r.path) && TABLE[r.path]);
    const wrong = named.flatMap((r) =>
      (["loader", "action"] as const).flatMap((k) =>
        [...(TABLE[r.path][k] ?? "")].flatMap((v, i) => (v === "F" && !(k === "action" && TABLE[r.path].loader?.[i] === "A") ? [`${k} ${r.path} expects a 403 for ${ROLES[i]}`] : [])),
      ),
    );
    expect(wrong).toEqual([]);
  });

  it("answers a made-up id exactly as a real id that is not the caller's", async () => {
    const ids = ["eventId", "competitionId", "entryId", "crewId", "uploadId", "fileId", "artifactId"];
    const madeUp = Object.fromEntries(Object.entries(world.params).map(([k, v]) => [k, ids.includes(k) ? crypto.randomUUID() : v]));
    const wrong: string[] = [];
    for (const r of ALL.filter((x) => ids.some((k) => x.path.includes(`:${k}`)))) {
      const row = TABLE[r.path];
      const mod = (await import(/* @vite-ignore */ `../../app/${r.file}`)) as { loader?: unknown; action?: unknown };
      for (const kind of ["loader", "action"] as const) {
        const expected = row?.[kind];
        if (!mod[kind] || !expected) continue;
        for (const [i, role] of ROLES.entries()) {
          if (expected[i] !== "N" && expected[i] !== "S") continue;
          const got = await outcome(mod[kind], kind, urlFor(r.path, madeUp), madeUp, world.cookies[role], row.body);
          const verdict = classify(kind, got.status, got.location);
          if (verdict !== expected[i]) wrong.push(`${kind} ${r.path} as ${role}: a real id is ${NAMES[expected[i]]}, a made-up one ${got.status}`);
        }
      }
    }
    expect(wrong).toEqual([]);
  }, 300_000);

  it("gives every role the expected outcome on every loader and action", async () => {
    const wrong: string[] = [];
    for (const r of ALL) {
      const row = TABLE[r.path];
      if (!row) continue;
      const mod = (await import(/* @vite-ignore */ `../../app/${r.file}`)) as { loader?: unknown; action?: unknown };
      for (const kind of ["loader", "action"] as const) {
        const expected = row[kind];
        const fn = mod[kind];
        if (!fn) {
          if (expected && expected !== ".........." && !(r.layout && kind === "action")) wrong.push(`${r.path} has no ${kind}, but its row expects one`);
          continue;
        }
        if (!expected) {
          wrong.push(`add a ${kind} column to the row for "${r.path}"`);
          continue;
        }
        const url = urlFor(r.path, world.params);
        for (const [i, role] of ROLES.entries()) {
          const want = expected[i];
          if (want === ".") continue;
          const got = await outcome(fn, kind, url, world.params, world.cookies[role], row.body);
          const verdict = classify(kind, got.status, got.location);
          if (verdict !== want) wrong.push(`${kind} ${r.path} as ${role}: expected ${NAMES[want]}, got ${got.status}${got.location ? ` → ${got.location}` : ""}`);
        }
      }
    }
    expect(wrong).toEqual([]);
  }, 300_000);
});

describe("cross-tenant ids", () => {
  it("refuses event B's objects inside event A's URLs, never finding them", async () => {
    const { a, b, cookies } = world;
    const bEntry = b.entries[0];
    const [bFile] = await db().query.uploadFiles.findMany({ where: (x, { eq }) => eq(x.uploadId, bEntry.uploadId) });
    const mixed: { file: string; path: string; params: Record<string, string>; role: Role; kind?: "loader" | "action" }[] = [
      { file: "organize.$competitionId.entries.$entryId.refund", path: `/organize/${a.competitionId}/entries/${bEntry.id}/refund`, params: { competitionId: a.competitionId, entryId: bEntry.id }, role: "organizer" },
      { file: "organize.$competitionId.entries.$entryId.refund", path: `/organize/${a.competitionId}/entries/${bEntry.id}/refund`, params: { competitionId: a.competitionId, entryId: bEntry.id }, role: "organizer", kind: "action" },
      { file: "organize.$competitionId.entries.$entryId.history", path: `/organize/${a.competitionId}/entries/${bEntry.id}/history`, params: { competitionId: a.competitionId, entryId: bEntry.id }, role: "organizer" },
      { file: "organize.$competitionId.files.$fileId", path: `/organize/${a.competitionId}/files/${bFile.id}`, params: { competitionId: a.competitionId, fileId: bFile.id }, role: "organizer" },
      { file: "judging.$competitionId.entries.$entryId", path: `/judging/${a.competitionId}/entries/${bEntry.id}`, params: { competitionId: a.competitionId, entryId: bEntry.id }, role: "judge" },
      { file: "showcase.entry", path: `/e/${a.event.slug}/${a.slug}/entries/${bEntry.id}`, params: { eventSlug: a.event.slug, competitionSlug: a.slug, entryId: bEntry.id }, role: "anonymous" },
      { file: "showcase.entry", path: `/e/${b.event.slug}/${a.slug}/entries/${a.entries[0].id}`, params: { eventSlug: b.event.slug, competitionSlug: a.slug, entryId: a.entries[0].id }, role: "anonymous" },
      { file: "organize.$competitionId.jury", path: `/organize/${b.competitionId}/jury`, params: { competitionId: b.competitionId }, role: "organizer", kind: "action" },
    ];
    const wrong: string[] = [];
    for (const m of mixed) {
      const mod = (await import(/* @vite-ignore */ `../../app/routes/${m.file}.tsx`).catch(() => import(/* @vite-ignore */ `../../app/routes/${m.file}.ts`))) as Record<string, unknown>;
      const kind = m.kind ?? "loader";
      const got = await outcome(mod[kind], kind, m.path, m.params, cookies[m.role]);
      if (!REFUSED.has(classify(kind, got.status, got.location))) wrong.push(`${kind} ${m.path} as ${m.role}: got ${got.status}`);
    }
    expect(wrong).toEqual([]);
  });

  it("refuses event B's entry and criterion in a judge's score body, writing nothing", async () => {
    const { a, b, cookies } = world;
    const scoresApi = await import("~/routes/api.judging.$competitionId.scores");
    const body = { entryId: b.entries[0].id, criterionId: b.criteria[0].id, value: 7, version: 0 };
    const out = await callRoute(scoresApi.action, request(`/api/judging/${a.competitionId}/scores`, { cookie: cookies.judge, json: body }), { competitionId: a.competitionId });
    expect([400, 403, 404]).toContain(out.status);
    const mixed = { entryId: a.entries[1].id, criterionId: b.criteria[0].id, value: 7, version: 0 };
    const out2 = await callRoute(scoresApi.action, request(`/api/judging/${a.competitionId}/scores`, { cookie: cookies.judge, json: mixed }), { competitionId: a.competitionId });
    expect([400, 403, 404]).toContain(out2.status);
    const sheets = await db().query.scoresheets.findMany({ where: (s, { inArray }) => inArray(s.entryId, [b.entries[0].id]) });
    expect(sheets).toEqual([]);
    const { scores } = await import("~/db/schema");
    const { eq } = await import("drizzle-orm");
    expect(await db().select().from(scores).where(eq(scores.criterionId, b.criteria[0].id))).toEqual([]);
  });
});
