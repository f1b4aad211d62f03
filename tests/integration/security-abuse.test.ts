import { mkdtempSync, rmSync, writeFileSync, chmodSync } from "node:fs";
import { join } from "node:path";
import { tmpdir } from "node:os";
import type { RequestListener } from "node:http";
import request from "supertest";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { DEMO_RULESET, type Ruleset } from "~/rules/ruleset";
import { runPipeline } from "~/conformance/pipeline.server";
import { closeDb } from "~/db/client.server";
import { stopQueue } from "~/jobs/queue.server";
import { hostileDesigns } from "../fixtures/hostile/designs";
import { HOGS, hostileBodies, hostileBundles, mutatedLayouts } from "../abuse/corpus";
import { appOrigin, builtListener } from "../security/listener";
import { makeCompo } from "./showcase.fixtures";
import { makeEntrySetup } from "./entries-support";
import { makeUser, sessionCookie } from "../support/users";

/**
 * The abuse corpus through the real code: hostile bundles and mutated layouts through the whole check pipeline
 * (each gets a fail finding, none crashes it), hostile designs refused before any tool reads them, and hostile
 * bodies against form actions and JSON routes of the built app (a report or a clear 4xx, never a 5xx).
 */
const work = mkdtempSync(join(process.env.TEST_ROOT ?? tmpdir(), "abuse-"));
chmodSync(work, 0o755);
let n = 0;
const fresh = () => join(work, `run-${++n}`);
const RULES: Ruleset = DEMO_RULESET;

afterAll(async () => {
  rmSync(work, { recursive: true, force: true });
  await stopQueue();
  await closeDb();
});

describe("hostile bundles through the pipeline", () => {
  it("gives each a fail finding from intake and never reaches a tool", async () => {
    const bundles = await hostileBundles(work);
    const rssBefore = process.memoryUsage().rss;
    for (const b of bundles) {
      const result = await runPipeline({ ruleset: RULES, workDir: fresh(), bundlePath: b.path, simulate: false });
      const intake = result.findings.filter((f) => f.step === "intake");
      expect(intake.map((f) => f.rule).join(","), b.name).toContain(b.rule);
      expect(intake.every((f) => f.verdict === "fail"), b.name).toBe(true);
      expect(result.verdict, b.name).toBe("fail");
      expect(result.findings.some((f) => f.step === "source"), b.name).toBe(false);
    }
    // Streamed with limits: the bombs never sat in memory whole.
    expect(process.memoryUsage().rss - rssBefore).toBeLessThan(256 * 1024 * 1024);
  }, 120_000);
});

describe("mutated GDSII streams through the pipeline", () => {
  it("gives every mutation a report (a layout finding), none a crash", async () => {
    const cases = mutatedLayouts(40);
    let unreadable = 0;
    for (const c of cases) {
      const path = join(work, `mut-${c.seed}.gds`);
      writeFileSync(path, c.bytes);
      const result = await runPipeline({ ruleset: RULES, workDir: fresh(), layoutPath: path, simulate: false });
      const layout = result.findings.filter((f) => f.step === "layout");
      expect(layout.length, `seed ${c.seed} (${c.how})`).toBeGreaterThan(0);
      if (layout.some((f) => f.rule === "layout.read")) unreadable += 1;
    }
    // Most mutations break the stream; the reader says so as a finding instead of throwing.
    expect(unreadable).toBeGreaterThan(0);
  }, 180_000);
});

describe("hostile designs through the pipeline", () => {
  it("refuses system tasks and file access in the pre-check, before yosys or verilator see them", async () => {
    const designs = hostileDesigns({ marker: join(work, "should-never-exist"), secret: "/etc/shadow" });
    const { writeZip } = await import("../fixtures/hostile/archives");
    let refused = 0;
    for (const [name, files] of Object.entries(designs)) {
      const archive = join(work, `design-${name}.zip`);
      await writeZip(archive, Object.entries(files).map(([file, data]) => ({ name: file, data })));
      const result = await runPipeline({ ruleset: RULES, workDir: fresh(), bundlePath: archive, simulate: true, frames: 1, encode: false });
      expect(result.verdict, name).toBe("fail");
      if (result.skipped.some((s) => s.step === "source")) refused += 1;
    }
    expect(refused).toBeGreaterThan(0);
  }, 240_000);
});

describe("resource hogs through the pipeline with short limits", () => {
  it("ends each in a fail report, not a crash or a hung run", async () => {
    const ruleset: Ruleset = { ...RULES, simulation: { ...RULES.simulation, compileSeconds: 20, runSeconds: 10, memoryMb: 512, frames: 1 } };
    const { writeZip } = await import("../fixtures/hostile/archives");
    for (const [name, text] of Object.entries(HOGS)) {
      const archive = join(work, `hog-${name.replace(/\W+/g, "-")}.zip`);
      await writeZip(archive, [{ name: "top.v", data: text }]);
      const result = await runPipeline({ ruleset, workDir: fresh(), bundlePath: archive, simulate: true, frames: 1, encode: false });
      expect(result.verdict, name).toBe("fail");
      expect(result.findings.some((f) => f.verdict === "fail"), name).toBe(true);
    }
  }, 240_000);
});

describe("hostile bodies against actions and JSON routes", () => {
  let app: RequestListener;
  let host: string;
  beforeAll(async () => {
    app = await builtListener();
    host = new URL(appOrigin()).host;
  });

  it("answers each with a report or a clear 4xx, never a server error", async () => {
    const compo = await makeCompo({ state: "judging" });
    const judge = await makeUser();
    const { grantEventRole } = await import("../support/users");
    await grantEventRole(compo.event.id, judge.id, "judge");
    const setup = await makeEntrySetup();
    const targets: { path: string; cookie?: string; json: boolean }[] = [
      { path: "/sign-in", json: false },
      { path: "/sign-up", json: false },
      { path: "/crews/new", cookie: setup.cookie, json: false },
      { path: `/api/judging/${compo.competitionId}/scores`, cookie: await sessionCookie(judge), json: true },
      { path: `/api/ballots/${compo.competitionId}`, cookie: await sessionCookie(await makeUser()), json: true },
      { path: `/api/entries/${setup.entry.id}/uploads`, cookie: setup.cookie, json: true },
    ];
    const outcomes: string[] = [];
    for (const t of targets) {
      for (const body of hostileBodies()) {
        let req = request(app).post(t.path).set("Host", host).set("Origin", `http://${host}`);
        if (t.cookie) req = req.set("Cookie", t.cookie);
        let res: request.Response;
        if (body.form) res = await req.type("form").send(body.form);
        else if (body.json !== undefined) res = await req.set("Content-Type", "application/json").send(JSON.stringify(body.json));
        else res = await req.set("Content-Type", body.type ?? "text/plain").send(body.raw ?? "");
        outcomes.push(`${t.path} ${body.name}: ${res.status}`);
        expect(res.status, `${t.path} · ${body.name}: ${res.text.slice(0, 300)}`).toBeLessThan(500);
        if (t.json && res.status >= 400) expect(res.body?.error?.status, `${t.path} · ${body.name}`).toBe(res.status);
      }
    }
    expect(outcomes.length).toBe(targets.length * hostileBodies().length);
  }, 180_000);
});
