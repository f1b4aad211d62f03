import { execFileSync } from "node:child_process";
import { randomBytes } from "node:crypto";
import { existsSync } from "node:fs";
import { chmod, mkdtemp, readFile, rm, writeFile } from "node:fs/promises";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { DEMO_RULESET } from "~/rules/ruleset";
import { runSandboxed } from "~/sandbox/sandbox.server";
import { hostileDesigns, hostileModel, writeDesign, type HostileTargets } from "../../tests/fixtures/hostile/designs";
import { precheckPassed, precheckSources, scanPreprocessedSources } from "./precheck.server";
import { terminationSignal } from "./tool-run";
import { runSourceChecks } from "./yosys.server";

/**
 * Proof that hostile entries stay contained: the pre-check refuses them, and even when yosys and a
 * compiled verilator model run them on purpose, they act only inside the sandbox's build folder.
 */
let work: string;
let targets: HostileTargets;
let secretWords: [string, string];
let n = 0;

beforeAll(async () => {
  work = await mkdtemp(join(tmpdir(), "gc-contain-"));
  // The sandbox user must be able to reach build folders made below this one (traverse only).
  await chmod(work, 0o711);
  targets = { marker: join(work, "host-marker"), secret: join(work, "host-secret.hex") };
  secretWords = [randomBytes(4).toString("hex"), randomBytes(4).toString("hex")];
  await writeFile(targets.secret, `${secretWords[0]}\n${secretWords[1]}\n`);
});
afterAll(async () => {
  await rm(work, { recursive: true, force: true });
});

async function freshDir(): Promise<string> {
  return mkdtemp(join(work, `b${n++}-`));
}

/**
 * Whether a tool's output holds a 32-bit secret word: as hex, as a bit string (most significant
 * first, as yosys writes parameters) or as a list of "0"/"1" bits (least significant first, as yosys'
 * JSON writes constant connections).
 */
function leaks(text: string, word: string): boolean {
  const msbFirst = parseInt(word, 16).toString(2).padStart(32, "0");
  const bitList = [...text.matchAll(/"([01])"/g)].map((m) => m[1]).join("");
  return text.toLowerCase().includes(word) || text.includes(msbFirst) || bitList.includes([...msbFirst].reverse().join(""));
}

describe("the sandbox", () => {
  it("has only the loopback interface, runs as nobody and cannot write outside /build", async () => {
    const build = await freshDir();
    const outside = join(work, "written-from-inside");
    const run = await runSandboxed({
      command: "/bin/sh",
      args: ["-c", `cat /proc/net/dev; echo "== end of net"; id -u; touch ${outside} /usr/gc-probe 2>/dev/null; echo inside > /build/inside.txt; ls -d /home /root ${work} /etc/passwd /etc/shadow 2>/dev/null; echo "== etc"; ls /etc; true`],
      buildDir: build,
      limits: { wallSeconds: 20 },
    });
    expect(run.exitCode).toBe(0);
    // /proc/net/dev: two header lines, then one line per interface (proc(5)).
    const net = run.stdout.split("== end of net")[0];
    const interfaces = net.split("\n").filter((l) => /^\s*[\w.-]+:/.test(l)).map((l) => l.trim().split(":")[0]);
    expect(interfaces).toEqual(["lo"]);
    expect(run.stdout).toMatch(/^65534$/m); // the uid of "nobody" on Debian (base-passwd)
    expect(existsSync(outside)).toBe(false);
    expect(existsSync("/usr/gc-probe")).toBe(false);
    expect(await readFile(join(build, "inside.txt"), "utf8")).toBe("inside\n");
    // None of the host's home, account or temp folders is there; /etc holds only the shared-library
    // alternatives the sandbox binds for ffmpeg.
    expect(run.stdout).not.toMatch(/^\/(home|root|etc\/passwd|etc\/shadow|tmp\/gc-contain)/m);
    expect(run.stdout.split("== etc\n")[1].trim().split(/\s+/)).toEqual(["alternatives"]);
  });

  it("kills a busy loop at its CPU limit and a sleeper at its wall-clock limit", async () => {
    const busy = await runSandboxed({ command: "/bin/sh", args: ["-c", "while :; do :; done"], buildDir: await freshDir(), limits: { cpuSeconds: 1, wallSeconds: 30 } });
    expect(busy.timedOut).toBe(false);
    // RLIMIT_CPU sends SIGXCPU at the soft limit, SIGKILL at the hard one (setrlimit(2)).
    expect(["SIGXCPU", "SIGKILL"]).toContain(terminationSignal(busy));
    const sleeper = await runSandboxed({ command: "/bin/sleep", args: ["60"], buildDir: await freshDir(), limits: { wallSeconds: 1 } });
    expect(sleeper.timedOut).toBe(true);
  });
});

describe("hostile entries", () => {
  it("are refused by the pre-check before any tool runs", async () => {
    for (const [name, files] of Object.entries(hostileDesigns(targets))) {
      const dir = await freshDir();
      expect(precheckPassed(await precheckSources(dir, await writeDesign(dir, files))), name).toBe(false);
      expect(existsSync(join(dir, "proof")), name).toBe(false);
    }
    expect(existsSync(targets.marker)).toBe(false);
  });

  it("read nothing from the host even when yosys runs them on purpose", async () => {
    const designs = hostileDesigns(targets);
    // Control: unsandboxed, yosys does read the secret into its output, so the check below can fail.
    const control = await freshDir();
    await writeDesign(control, designs["readmemh-outside"]);
    execFileSync("yosys", ["-q", "-p", `read_verilog top.v; hierarchy -top gc_entry; proc; write_json ${join(control, "out.json")}`], { cwd: control });
    expect(leaks(await readFile(join(control, "out.json"), "utf8"), secretWords[0])).toBe(true);

    for (const name of ["system-plain", "fopen", "readmemh-outside", "include-absolute"]) {
      const dir = await freshDir();
      const { findings } = await runSourceChecks(dir, await writeDesign(dir, designs[name]), DEMO_RULESET);
      expect(findings.some((f) => f.verdict === "fail"), name).toBe(true);
      const text = JSON.stringify(findings);
      for (const word of secretWords) expect(leaks(text, word), name).toBe(false);
    }
    const include = await freshDir();
    const preprocessed = await scanPreprocessedSources(include, await writeDesign(include, designs["include-absolute"]));
    expect(leaks(JSON.stringify(preprocessed), secretWords[0])).toBe(false);
    expect(existsSync(targets.marker)).toBe(false);
  });

  it("touch only the build folder when verilator compiles and runs a $system/$fopen model on purpose", async () => {
    const build = await freshDir();
    await writeFile(join(build, "top.v"), hostileModel(targets));
    const compile = await runSandboxed({
      command: "verilator",
      args: ["--binary", "-j", "2", "-Wno-fatal", "--top-module", "gc_entry", "-Mdir", "obj", "top.v"],
      buildDir: build,
      limits: { wallSeconds: 180 },
    });
    expect(compile.exitCode, compile.stderr.slice(-2000)).toBe(0);
    const model = await runSandboxed({ command: "/build/obj/Vgc_entry", args: [], buildDir: build, limits: { wallSeconds: 20 } });
    expect(model.exitCode).toBe(0);
    // It did run: it wrote inside the build folder, as nobody...
    expect(await readFile(join(build, "proof"), "utf8")).toBe("contained");
    expect((await readFile(join(build, "proof-uid"), "utf8")).trim()).toBe("65534");
    // ...and nothing on the host.
    expect(existsSync(targets.marker)).toBe(false);
    expect(existsSync(`${targets.marker}.fopen`)).toBe(false);
  });
});
