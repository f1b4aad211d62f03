import { eq } from "drizzle-orm";
import { readFileSync } from "node:fs";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { zipOf } from "../support/archives";
import { closeDb, db } from "~/db/client.server";
import { artifacts, checkRuns, findings } from "~/db/schema";
import { executeCheckRun } from "~/conformance/run.server";
import { queueCheckRun } from "~/conformance/queue.server";
import { stopQueue } from "~/jobs/queue.server";
import * as artifactRoute from "~/routes/artifacts.$artifactId";
import * as checksApi from "~/routes/api.checks.$entryId";
import { designPath } from "../../demo/designs/index";
import { demoEntryLayout } from "../../demo/designs/layouts";
import { makeCompetitionWithEntry, makeCompleteUpload } from "../support/entries";
import { callRoute, routeArgs } from "../support/routes";
import { makeEvent, makeUser, request, sessionCookie } from "../support/users";


let setup: Awaited<ReturnType<typeof prepare>>;

async function prepare() {
  const event = await makeEvent();
  const captain = await makeUser();
  const stranger = await makeUser();
  const made = await makeCompetitionWithEntry({ eventId: event.id, captainId: captain.id, state: "open" });
  const bundle = await zipOf({ "xor.v": readFileSync(designPath("xor-tide")) });
  // the layout of this design: its 58 flip-flops and its ports, so the layout-against-source findings pass
  const layout = demoEntryLayout("xor-tide").bytes;
  const upload = await makeCompleteUpload(made.entry.id, 1, [
    { kind: "bundle", bytes: bundle, filename: "xor.zip", mediaType: "application/zip" },
    { kind: "layout", bytes: layout, filename: "xor.gds", mediaType: "application/vnd.gdsii" },
  ]);
  const runId = await queueCheckRun(upload.id);
  return { event, captain, stranger, ...made, upload, runId };
}

beforeAll(async () => {
  setup = await prepare();
}, 120_000);
afterAll(async () => {
  await stopQueue();
  await closeDb();
});

describe("a check run in the worker", () => {
  it("runs every step once, stores findings, figures and artifacts, and is not repeated", async () => {
    expect(await executeCheckRun(setup.runId)).toBe("done");
    const [run] = await db().select().from(checkRuns).where(eq(checkRuns.id, setup.runId));
    expect(run.state).toBe("done");
    expect(run.verdict).toBe("pass");
    expect(run.attempts).toBe(1);
    const rows = await db().select().from(findings).where(eq(findings.checkRunId, setup.runId));
    const rules = rows.map((r) => r.rule);
    for (const rule of ["intake.bundle", "precheck.clean", "source.top", "layout.die.size", "video.hsync.period", "flash.general"]) expect(rules).toContain(rule);
    const kinds = (await db().select().from(artifacts).where(eq(artifacts.checkRunId, setup.runId))).map((a) => a.kind).sort();
    expect(kinds).toEqual(["contact-sheet", "first-frame", "layout-png", "layout-svg", "mp4", "waveform", "wav", "webm"].sort());
    const figures = run.figures as { video: { hsync: { periodClocks: number } } };
    // VESA DMT 640x480@60: 800 pixel clocks per line.
    expect(figures.video.hsync.periodClocks).toBe(800);

    // A second delivery of the same job (a retry after a lost acknowledgement) changes nothing.
    expect(await executeCheckRun(setup.runId)).toBe("skipped");
    const again = await db().select().from(findings).where(eq(findings.checkRunId, setup.runId));
    expect(again).toHaveLength(rows.length);
  }, 240_000);

  it("shows the report to the crew through the JSON API and refuses strangers", async () => {
    const own = (await checksApi.loader((await routeArgs(request(`/api/checks/${setup.entry.id}`, { cookie: await sessionCookie(setup.captain) }), { entryId: setup.entry.id })) as never)) as Response;
    expect(own.status).toBe(200);
    const body = (await own.json()) as { check: { run: { verdict: string }; artifacts: Record<string, { url: string }> } };
    expect(body.check.run.verdict).toBe("pass");
    expect(body.check.artifacts.webm.url).toMatch(/^\/artifacts\//);
    const other = await callRoute(checksApi.loader, request(`/api/checks/${setup.entry.id}`, { cookie: await sessionCookie(setup.stranger) }), { entryId: setup.entry.id });
    expect(other.status).toBe(404);
  });

  it("streams artifacts to insiders with byte ranges, and not to the public while the compo is open", async () => {
    const [mine] = (await db().select().from(artifacts).where(eq(artifacts.checkRunId, setup.runId))).filter((a) => a.kind === "first-frame");
    const cookie = await sessionCookie(setup.captain);
    const full = (await artifactRoute.loader((await routeArgs(request(`/artifacts/${mine.id}`, { cookie }), { artifactId: mine.id })) as never)) as Response;
    expect(full.status).toBe(200);
    const bytes = Buffer.from(await full.arrayBuffer());
    // PNG signature, from the PNG specification (ISO/IEC 15948): 89 50 4E 47 0D 0A 1A 0A.
    expect(bytes.subarray(0, 8).toString("hex")).toBe("89504e470d0a1a0a");
    expect(bytes.length).toBe(mine.sizeBytes);
    const part = (await artifactRoute.loader((await routeArgs(request(`/artifacts/${mine.id}`, { cookie, headers: { range: "bytes=1-3" } }), { artifactId: mine.id })) as never)) as Response;
    expect(part.status).toBe(206);
    expect(part.headers.get("content-range")).toBe(`bytes 1-3/${mine.sizeBytes}`);
    expect(Buffer.from(await part.arrayBuffer()).toString("latin1")).toBe("PNG");
    const anonymous = await callRoute(artifactRoute.loader, request(`/artifacts/${mine.id}`), { artifactId: mine.id });
    expect(anonymous.status).toBe(404);
  });

  it("shows the source and layout findings and then the first still through the API while the run goes on", async () => {
    const upload = await makeCompleteUpload(setup.entry.id, 2, [
      { kind: "bundle", bytes: await zipOf({ "copper.v": readFileSync(designPath("copper-sine")) }), filename: "copper.zip", mediaType: "application/zip" },
      { kind: "layout", bytes: demoEntryLayout("copper-sine").bytes, filename: "copper.gds", mediaType: "application/vnd.gdsii" },
    ]);
    const runId = await queueCheckRun(upload.id);
    const cookie = await sessionCookie(setup.captain);
    type Check = { run: { id: string; state: string; step: string | null }; findings: { rule: string }[]; artifacts: Record<string, unknown> };
    const seen: Check[] = [];
    const running = executeCheckRun(runId);
    let finished = false;
    void running.finally(() => (finished = true));
    while (!finished) {
      const res = (await checksApi.loader((await routeArgs(request(`/api/checks/${setup.entry.id}`, { cookie }), { entryId: setup.entry.id })) as never)) as Response;
      const body = (await res.json()) as { check: Check };
      if (body.check.run.id === runId) seen.push(body.check);
      await new Promise((r) => setTimeout(r, 50));
    }
    expect(await running).toBe("done");
    const rules = (c: Check) => c.findings.map((f) => f.rule);
    // source and layout findings while the reference capture is still being made (no timing finding yet)
    const early = seen.find((c) => c.run.state === "running" && rules(c).includes("source.top") && rules(c).includes("layout.die.size"));
    expect(early, JSON.stringify(seen.map((c) => [c.run.state, c.run.step, c.findings.length]))).toBeDefined();
    expect(rules(early!)).not.toContain("video.hsync.period");
    // the first still before the preview videos
    const still = seen.find((c) => c.run.state === "running" && c.artifacts["first-frame"] && !c.artifacts.webm);
    expect(still).toBeDefined();
  }, 240_000);
});
