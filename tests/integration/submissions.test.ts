import { and, eq, like } from "drizzle-orm";
import { readFileSync } from "node:fs";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { closeDb, db } from "~/db/client.server";
import { auditLog, checkRuns, competitions, eventRoles, findings, outbox, uploads } from "~/db/schema";
import { executeCheckRun } from "~/conformance/run.server";
import { latestCheckFor } from "~/conformance/report.server";
import { uploadsOfEntry } from "~/entries/service.server";
import { lateNoteForJury } from "~/entries/late-exception.server";
import type { UploadComparison } from "~/entries/compare";
import { eligibleEntries } from "~/showcase/showcase.server";
import { stopQueue } from "~/jobs/queue.server";
import { rulesetSchema } from "~/rules/ruleset";
import { TEST_RULESET } from "../support/rulesets";
import * as entryPage from "~/routes/entries.$entryId";
import * as rulesetRoute from "~/routes/e.$eventSlug.$competitionSlug.ruleset[.]json";
import * as starterRoute from "~/routes/e.$eventSlug.$competitionSlug.starter[.]zip";
import { designPath } from "../../demo/designs/index";
import { demoEntryLayout } from "../../demo/designs/layouts";
import { commitTree, startGitServer, type GitServer } from "../support/git-server";
import { callRoute, routeArgs } from "../support/routes";
import { makeUser, request, sessionCookie } from "../support/users";
import { zipOf } from "../support/archives";
import { makeEntrySetup } from "./entries-support";
import { complete, confirm, sendParts, start } from "./upload-api";

/**
 * What crews really submit, end to end against the real database, the S3 fake and the real tools: a repository link
 * and commit (served by git's own http-backend on loopback), a licence, the pick of the judged upload, an organizer's
 * late exception and two uploads compared.
 */
let git: GitServer;
let commit: string;
const layout = Buffer.from(demoEntryLayout("xor-tide").bytes);

beforeAll(async () => {
  git = await startGitServer();
  commit = commitTree(git, "crews/tide.git", { "rtl/tide.v": readFileSync(designPath("xor-tide")), "LICENSE": "MIT\n" }, undefined, { history: [{ "rtl/tide.v": "// later work in progress\n" }] });
});
afterAll(async () => {
  await git.close();
  await stopQueue();
  await closeDb();
});

type Setup = Awaited<ReturnType<typeof makeEntrySetup>>;

/** One upload through the API; `source` is the body's repository and licence. */
async function uploadVia(s: Setup, source: Record<string, unknown>, files: { kind: string; filename: string; bytes: Buffer }[]) {
  const st = await start(s, files.map((f) => ({ kind: f.kind, filename: f.filename, size: f.bytes.length })), source);
  if (st.status !== 201) return { started: st, done: null };
  for (const f of st.body.files) {
    const bytes = files.find((x) => x.kind === f.kind)!.bytes;
    await sendParts(s.cookie, st.body.uploadId, f, bytes);
    expect((await confirm(s.cookie, st.body.uploadId, f)).status).toBe(200);
  }
  return { started: st, done: await complete(s.cookie, st.body.uploadId) };
}

const layoutFile = { kind: "layout", filename: "tide.gds", bytes: layout };

async function runCheckOf(uploadId: string) {
  const [run] = await db().select().from(checkRuns).where(eq(checkRuns.uploadId, uploadId));
  expect(await executeCheckRun(run.id, { simulate: false })).toBe("done");
  const [after] = await db().select().from(checkRuns).where(eq(checkRuns.id, run.id));
  return { run: after, findings: await db().select().from(findings).where(eq(findings.checkRunId, run.id)) };
}

describe("sources by repository link and commit", () => {
  it("records the commit on the upload and its receipt, and the check run fetches exactly that commit", async () => {
    const s = await makeEntrySetup();
    const { started, done } = await uploadVia(s, { repository: { url: git.url("crews/tide.git"), commit }, licence: "MIT" }, [layoutFile]);
    expect(started.status).toBe(201);
    expect(done?.body).toMatchObject({ number: 1, state: "complete" });
    const [u] = await db().select().from(uploads).where(eq(uploads.id, started.body.uploadId));
    expect(u).toMatchObject({ repositoryUrl: git.url("crews/tide.git"), repositoryCommit: commit, licence: "MIT" });
    const [mail] = await db().select().from(outbox).where(and(eq(outbox.toAddress, s.entrant.email), like(outbox.subject, "Upload receipt%")));
    expect(mail.textBody).toContain(`commit ${commit}`);
    expect(mail.textBody).toContain(git.url("crews/tide.git"));
    expect(mail.textBody).toContain("Licence\n  MIT");

    const checked = await runCheckOf(u.id);
    const rules = Object.fromEntries(checked.findings.map((f) => [f.rule, f]));
    expect(rules["intake.repository"]).toMatchObject({ verdict: "pass" });
    expect(rules["intake.repository"].measured).toContain(commit);
    // the tree of that commit (not the later one) went through intake, pre-check and yosys, and matches its layout
    expect(rules["source.top"]).toMatchObject({ verdict: "pass" });
    expect(rules["layout.matches.flipflops"]).toMatchObject({ verdict: "pass", measured: "58" });
    expect(rules["layout.matches.ports"]).toMatchObject({ verdict: "pass" });
    expect((checked.run.figures as { repository: { commit: string } }).repository.commit).toBe(commit);
    expect((await uploadsOfEntry(s.entry.id))[0].repository).toEqual({ url: git.url("crews/tide.git"), commit });
  }, 180_000);

  it("fails the check run clearly when the repository has no such commit", async () => {
    const s = await makeEntrySetup();
    const wrong = "f".repeat(40);
    const { started } = await uploadVia(s, { repository: { url: git.url("crews/tide.git"), commit: wrong } }, [layoutFile]);
    const checked = await runCheckOf(started.body.uploadId);
    expect(checked.run.verdict).toBe("fail");
    const f = checked.findings.find((x) => x.rule === "intake.repository.no-commit");
    expect(f?.evidence).toMatch(new RegExp(`has no commit ${wrong}`));
    expect(checked.findings.some((x) => x.step === "source")).toBe(false);
  }, 120_000);

  it("refuses unsafe links, short commits and a bundle beside a link at the form, before anything is stored", async () => {
    const s = await makeEntrySetup();
    const cases: [Record<string, unknown>, string, RegExp][] = [
      [{ url: "file:///etc", commit }, "repository", /file:\/\//],
      [{ url: "ext::sh -c id", commit }, "repository", /spaces|transport/],
      [{ url: `http://crew:pw@127.0.0.1/x.git`, commit }, "repository", /user name or password/],
      [{ url: "https://192.168.0.10/x.git", commit }, "repository", /private network/],
      [{ url: git.url("crews/tide.git"), commit: commit.slice(0, 7) }, "commit", /full commit hash/],
    ];
    for (const [repository, field, message] of cases) {
      const st = await start(s, [{ kind: "layout", filename: "t.gds", size: layout.length }], { repository });
      expect(st.status, JSON.stringify(repository)).toBe(400);
      expect(st.body.error?.fieldErrors?.[field]?.join(" ")).toMatch(message);
    }
    const both = await start(s, [{ kind: "bundle", filename: "b.zip", size: 10 }, { kind: "layout", filename: "t.gds", size: layout.length }], { repository: { url: git.url("crews/tide.git"), commit } });
    expect(both.body.error?.fieldErrors?.bundle?.[0]).toMatch(/either a source bundle or a repository link/);
    expect(await db().select().from(uploads).where(eq(uploads.entryId, s.entry.id))).toHaveLength(0);
  });

  it("takes no repository link where the ruleset allows bundles only", async () => {
    const s = await makeEntrySetup({ ruleset: { ...TEST_RULESET, repository: { ...TEST_RULESET.repository, allowed: false } } });
    const st = await start(s, [{ kind: "layout", filename: "t.gds", size: layout.length }], { repository: { url: git.url("crews/tide.git"), commit } });
    expect(st.body.error?.fieldErrors?.repository?.[0]).toMatch(/source bundles only/);
  });
});

describe("the licence field", () => {
  it("is checked against the SPDX list, and can be required open", async () => {
    const s = await makeEntrySetup({ ruleset: { ...TEST_RULESET, licence: { required: true, openOnly: true } } });
    const files = [{ kind: "bundle", filename: "b.zip", size: 10 }, { kind: "layout", filename: "t.gds", size: layout.length }];
    expect((await start(s, files)).body.error?.fieldErrors?.licence?.[0]).toMatch(/asks for the licence/);
    expect((await start(s, files, { licence: "Beerware-ish" })).body.error?.fieldErrors?.licence?.[0]).toMatch(/not an SPDX licence/);
    expect((await start(s, files, { licence: "CC-BY-NC-4.0" })).body.error?.fieldErrors?.licence?.[0]).toMatch(/only open source licences/);
    const ok = await start(s, files, { licence: "CERN-OHL-S-2.0" });
    expect(ok.status).toBe(201);
    const [u] = await db().select().from(uploads).where(eq(uploads.id, ok.body.uploadId));
    expect(u.licence).toBe("CERN-OHL-S-2.0");
  });
});

describe("which upload is judged", () => {
  const bundleFile = async () => ({ kind: "bundle", filename: "tide.zip", bytes: await zipOf({ "tide.v": readFileSync(designPath("xor-tide")) }) });

  it("is the newest on-time one, or the one the crew picks before the deadline; a new upload takes the pick's place", async () => {
    const s = await makeEntrySetup();
    for (let i = 0; i < 2; i++) expect((await uploadVia(s, {}, [await bundleFile(), layoutFile])).done?.body).toMatchObject({ state: "complete" });
    expect((await uploadsOfEntry(s.entry.id)).find((u) => u.counts)?.number).toBe(2);

    const form = (fields: Record<string, string>) => request(`/entries/${s.entry.id}`, { cookie: s.cookie, form: fields });
    const picked = await callRoute<{ notice?: string; error?: string }>(entryPage.action, form({ intent: "final", upload: "1" }), { entryId: s.entry.id });
    expect(picked.data?.notice).toMatch(/Upload #1 is now the one that is judged/);
    const list = await uploadsOfEntry(s.entry.id);
    expect(list.find((u) => u.counts)).toMatchObject({ number: 1, picked: true });
    expect((await latestCheckFor(s.entry.id))?.uploadNumber).toBe(1);
    expect((await eligibleEntries(s.competition.id)).find((e) => e.id === s.entry.id)?.uploadNumber).toBe(1);
    const [audited] = await db().select().from(auditLog).where(and(eq(auditLog.subjectId, s.entry.id), eq(auditLog.action, "entry.final-upload")));
    expect(audited.details).toEqual({ uploadNumber: 1 });

    await uploadVia(s, {}, [await bundleFile(), layoutFile]);
    expect((await uploadsOfEntry(s.entry.id)).find((u) => u.counts)).toMatchObject({ number: 3, picked: false });
  }, 120_000);

  it("cannot be changed after the deadline, nor to a late upload", async () => {
    const s = await makeEntrySetup();
    await uploadVia(s, {}, [await bundleFile(), layoutFile]);
    await uploadVia(s, {}, [await bundleFile(), layoutFile]);
    await db().update(competitions).set({ deadlineAt: new Date(Date.now() - 60_000) }).where(eq(competitions.id, s.competition.id));
    const out = await callRoute<{ error?: string }>(entryPage.action, request(`/entries/${s.entry.id}`, { cookie: s.cookie, form: { intent: "final", upload: "1" } }), { entryId: s.entry.id });
    expect(out.data?.error).toMatch(/deadline has passed/);
    expect((await uploadsOfEntry(s.entry.id)).find((u) => u.counts)?.number).toBe(2);
  }, 120_000);
});

describe("an organizer's late exception", () => {
  it("lets one crew's upload after the deadline count, with the reason on record for the crew and the jury", async () => {
    const s = await makeEntrySetup({ deadlineAt: new Date(Date.now() + 60 * 60_000) });
    const organizer = await makeUser({ name: "Ora Ganiser" });
    await db().insert(eventRoles).values({ eventId: s.event.id, userId: organizer.id, role: "organizer" });
    const orgCookie = await sessionCookie(organizer);
    // the deadline passes; the competition closes
    await db().update(competitions).set({ deadlineAt: new Date(Date.now() - 60_000), state: "closed" }).where(eq(competitions.id, s.competition.id));
    const files = [{ kind: "bundle", filename: "tide.zip", bytes: await zipOf({ "tide.v": readFileSync(designPath("xor-tide")) }) }, layoutFile];
    const refused = await start(s, files.map((f) => ({ kind: f.kind, filename: f.filename, size: f.bytes.length })));
    expect(refused.body.error?.code).toBe("competition_not_open");

    const act = (cookie: string, fields: Record<string, string>) => callRoute<{ notice?: string; error?: string; field?: string }>(entryPage.action, request(`/entries/${s.entry.id}`, { cookie, form: fields }), { entryId: s.entry.id });
    const inTwoHours = new Date(Date.now() + 2 * 3600_000);
    const wall = new Intl.DateTimeFormat("sv-SE", { timeZone: s.event.timeZone, year: "numeric", month: "2-digit", day: "2-digit", hour: "2-digit", minute: "2-digit" }).format(inTwoHours).replace(" ", "T");
    expect((await act(s.cookie, { intent: "grant-late", until: wall, reason: "power cut at table 12" })).status).toBe(403);
    expect((await act(orgCookie, { intent: "final", upload: "1" })).status).toBe(403); // the pick is the crew's
    expect((await act(orgCookie, { intent: "grant-late", until: wall, reason: "oops" })).data).toMatchObject({ field: "reason" });
    expect((await act(orgCookie, { intent: "grant-late", until: wall, reason: "power cut at table 12" })).data?.notice).toMatch(/Late exception granted/);
    const [audited] = await db().select().from(auditLog).where(and(eq(auditLog.subjectId, s.entry.id), eq(auditLog.action, "entry.late-exception.grant")));
    expect(audited.actorUserId).toBe(organizer.id);
    expect(audited.details).toMatchObject({ reason: "power cut at table 12" });

    const { done, started } = await uploadVia(s, {}, files);
    expect(done?.body).toMatchObject({ number: 1, state: "complete", message: expect.stringMatching(/late exception/) });
    const [u] = await db().select().from(uploads).where(eq(uploads.id, started.body.uploadId));
    expect(u.lateException).toBe(true);
    const [mail] = await db().select().from(outbox).where(and(eq(outbox.toAddress, s.entrant.email), like(outbox.subject, "Upload receipt%")));
    expect(mail.textBody).toContain("power cut at table 12");
    const page = await callRoute<{ lateException: { reason: string } | null }>(entryPage.loader, request(`/entries/${s.entry.id}`, { cookie: s.cookie }), { entryId: s.entry.id });
    expect(page.data?.lateException?.reason).toBe("power cut at table 12");
    expect(await lateNoteForJury(s.entry.id)).toMatchObject({ judgedUploadLate: true, exception: { reason: "power cut at table 12", grantedBy: "Ora Ganiser" } });
  }, 120_000);
});

describe("comparing two uploads", () => {
  it("puts both check runs' findings and figures side by side on the entry page", async () => {
    const s = await makeEntrySetup();
    const other = Buffer.from(demoEntryLayout("munch-squares").bytes);
    const a = await uploadVia(s, {}, [{ kind: "bundle", filename: "t.zip", bytes: await zipOf({ "tide.v": readFileSync(designPath("xor-tide")) }) }, layoutFile]);
    // The first run goes before the second upload: a newer upload supersedes a run still waiting.
    await runCheckOf(a.started.body.uploadId);
    const b = await uploadVia(s, {}, [{ kind: "bundle", filename: "t.zip", bytes: await zipOf({ "tide.v": readFileSync(designPath("xor-tide")) }) }, { kind: "layout", filename: "other.gds", bytes: other }]);
    await runCheckOf(b.started.body.uploadId);
    const page = await callRoute<{ comparison: UploadComparison | null }>(entryPage.loader, request(`/entries/${s.entry.id}?a=1&b=2`, { cookie: s.cookie }), { entryId: s.entry.id });
    const c = page.data!.comparison!;
    expect(c.a.number).toBe(1);
    expect(c.b.number).toBe(2);
    expect(c.figures.find((f) => f.label === "Flip-flops (layout)")).toMatchObject({ a: "58", b: "53", changed: true });
    expect(c.findings.find((f) => f.rule === "layout.matches.flipflops")).toMatchObject({ a: { verdict: "pass" }, b: { verdict: "fail" }, changed: true });
    expect(c.findings.find((f) => f.rule === "source.top")?.changed).toBe(false);
  }, 180_000);
});

describe("the public rules page's downloads", () => {
  it("serves the compo's ruleset and starter bundle once the compo is public, and nothing for a draft", async () => {
    const open = await makeEntrySetup();
    const params = { eventSlug: open.event.slug, competitionSlug: open.competition.slug };
    const json = await callRoute(rulesetRoute.loader, request(`/e/${params.eventSlug}/${params.competitionSlug}/ruleset.json`), params);
    expect(json.status).toBe(200);
    const res = (await rulesetRoute.loader((await routeArgs(request("/x"), params)) as never)) as Response;
    expect(rulesetSchema.parse(await res.json())).toEqual(TEST_RULESET);
    const zip = (await starterRoute.loader((await routeArgs(request("/x"), params)) as never)) as Response;
    const bytes = Buffer.from(await zip.arrayBuffer());
    expect(bytes.subarray(0, 4)).toEqual(Buffer.from([0x50, 0x4b, 0x03, 0x04])); // PKWARE APPNOTE 4.3.7: local file header
    // Stored names are plain text in a zip's headers: the design, the testbench, the ruleset and the README.
    for (const name of ["gc_entry.v", "check/gc_entry_check.tb", "ruleset.json", "README.md"]) expect(bytes.includes(Buffer.from(name))).toBe(true);

    const draft = await makeEntrySetup({ state: "draft" });
    const hidden = { eventSlug: draft.event.slug, competitionSlug: draft.competition.slug };
    expect((await callRoute(starterRoute.loader, request("/x"), hidden)).status).toBe(404);
    expect((await callRoute(rulesetRoute.loader, request("/x"), hidden)).status).toBe(404);
  });
});
