import { spawnSync } from "node:child_process";
import { chmodSync, existsSync, mkdtempSync, rmSync, writeFileSync } from "node:fs";
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
/** The hostile bundles, written once per file and shared by the tests that need them. */
let bundlesWritten: ReturnType<typeof hostileBundles> | undefined;
const bundles = () => (bundlesWritten ??= hostileBundles(work));

afterAll(async () => {
  rmSync(work, { recursive: true, force: true });
  await stopQueue();
  await closeDb();
});

describe("hostile bundles through the pipeline", () => {
  it("gives each its own intake refusal and starts no step after the intake", async () => {
    for (const b of await bundles()) {
      const steps: string[] = [];
      const result = await runPipeline({ ruleset: RULES, workDir: fresh(), bundlePath: b.path, simulate: false, onStep: (s) => void steps.push(s) });
      const intake = result.findings.filter((f) => f.step === "intake");
      expect(intake.map((f) => f.rule), b.name).toContain(b.rule);
      expect(intake.every((f) => f.verdict === "fail"), b.name).toBe(true);
      expect(result.verdict, b.name).toBe("fail");
      expect(result.internalErrors, b.name).toEqual([]);
      // no pre-check, no yosys: the only step that ran is the intake
      expect(steps, b.name).toEqual(["intake"]);
    }
  }, 120_000);

  it("refuses the bombs while streaming: a process of its own grows far less than one bomb unpacked", async () => {
    const bombs = (await bundles()).filter((b) => b.rule === "intake.zip-bomb");
    expect(bombs.map((b) => b.name)).toEqual(["zip bomb (64 MiB of zeros)", "tar.gz bomb"]);
    const child = spawnSync(process.execPath, ["--import", "tsx", "tests/abuse/intake-memory.ts", join(work, "memory"), ...bombs.map((b) => b.path)], {
      encoding: "utf8",
      env: process.env,
    });
    expect(child.status, child.stderr).toBe(0);
    const out = JSON.parse(child.stdout.trim().split("\n").at(-1)!) as { baselineKb: number; peakKb: number; runs: { intake: { rule: string }[] }[] };
    for (const run of out.runs) expect(run.intake.map((f) => f.rule)).toEqual(["intake.zip-bomb"]);
    // The bombs unpack to 64 MiB and 40 MiB of zeros; held whole, either would raise the peak by that much. Streamed
    // and cut at the compression-ratio limit, both together raised it by about 6 MiB when this was written.
    const grewMiB = (out.peakKb - out.baselineKb) / 1024;
    expect(grewMiB).toBeLessThan(16);
  }, 120_000);
});

describe("mutated GDSII streams through the pipeline", () => {
  it("gives every mutation a report from the reader, none a crash", async () => {
    const cases = mutatedLayouts(40);
    for (const c of cases) {
      const path = join(work, `mut-${c.seed}.gds`);
      writeFileSync(path, c.bytes);
      const result = await runPipeline({ ruleset: RULES, workDir: fresh(), layoutPath: path, simulate: false });
      const what = `seed ${c.seed} (${c.how})`;
      // a throw that is not the reader's own refusal would show as an internal error and a layout.internal finding
      expect(result.internalErrors, what).toEqual([]);
      const layout = result.findings.filter((f) => f.step === "layout");
      expect(layout.length, what).toBeGreaterThan(0);
      expect(layout.some((f) => f.rule === "layout.internal"), what).toBe(false);
      // A stream cut short has lost its ENDLIB record (type 0x04), which the GDSII Stream Format Manual, release 6.0,
      // puts last in every library: it cannot be read as a whole library.
      if (c.how === "truncated") expect(layout.map((f) => f.rule), what).toEqual(["layout.read"]);
    }
  }, 180_000);
});

describe("hostile designs through the pipeline", () => {
  // The pre-check rule each design must earn (app/sources/precheck-rules.ts): system tasks and file access are
  // system calls, an `include of an absolute path a directive, a DPI import a foreign function.
  const EXPECTED: Record<string, string> = {
    "system-plain": "precheck.system-call",
    "system-pasted": "precheck.system-call",
    fopen: "precheck.system-call",
    "readmemh-outside": "precheck.system-call",
    "include-absolute": "precheck.directive",
    "dpi-import": "precheck.dpi",
  };

  it("refuses each in the pre-check, so neither synthesis nor simulation ever starts on it", async () => {
    const marker = join(work, "should-never-exist");
    const designs = hostileDesigns({ marker, secret: "/etc/shadow" });
    expect(Object.keys(designs).sort()).toEqual(Object.keys(EXPECTED).sort());
    const { writeZip } = await import("../fixtures/hostile/archives");
    for (const [name, files] of Object.entries(designs)) {
      const archive = join(work, `design-${name}.zip`);
      await writeZip(archive, Object.entries(files).map(([file, data]) => ({ name: file, data })));
      const steps: string[] = [];
      const result = await runPipeline({ ruleset: RULES, workDir: fresh(), bundlePath: archive, simulate: true, frames: 1, encode: false, onStep: (s) => void steps.push(s) });
      expect(result.verdict, name).toBe("fail");
      const precheck = result.findings.filter((f) => f.step === "precheck");
      expect(precheck.filter((f) => f.verdict === "fail").map((f) => f.rule), name).toContain(EXPECTED[name]);
      expect(steps, name).toEqual(["intake", "precheck"]);
      // skipped: source and simulation for the refusal, layout because this upload has none
      expect(result.skipped.map((s) => s.step).sort(), name).toEqual(["layout", "simulation", "source"]);
      expect(result.findings.some((f) => f.step === "source" || f.step === "simulation"), name).toBe(false);
      expect(existsSync(marker), name).toBe(false);
    }
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
    for (const t of targets) {
      for (const body of hostileBodies()) {
        let req = request(app).post(t.path).set("Host", host).set("Origin", `http://${host}`);
        if (t.cookie) req = req.set("Cookie", t.cookie);
        let res: request.Response;
        if (body.form) res = await req.type("form").send(body.form);
        else if (body.json !== undefined) res = await req.set("Content-Type", "application/json").send(JSON.stringify(body.json));
        else res = await req.set("Content-Type", body.type ?? "text/plain").send(body.raw ?? "");
        expect(res.status, `${t.path} · ${body.name}: ${res.text.slice(0, 300)}`).toBeLessThan(500);
        if (t.json && res.status >= 400) expect(res.body?.error?.status, `${t.path} · ${body.name}`).toBe(res.status);
      }
    }
  }, 180_000);
});
