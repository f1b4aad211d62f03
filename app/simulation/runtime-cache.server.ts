import { chmodSync, copyFileSync, existsSync, mkdirSync, mkdtempSync, renameSync, rmSync, statSync, writeFileSync } from "node:fs";
import { createHash } from "node:crypto";
import { cpus, tmpdir } from "node:os";
import { join } from "node:path";
import { runSandboxed } from "~/sandbox/sandbox.server";

/**
 * What every model build needs and no design changes, built once per machine from a built-in trusted design:
 * - verilator's runtime library (verilated.o, verilated_threads.o), most of a build's time, copied into each build;
 * - a precompiled verilated.h (GCC's .gch), compiled with exactly the make flags the model and harness are
 *   compiled with, shown read-only inside the sandbox: parsing that header was half of each file's compile.
 * Nothing is ever copied back from an entrant's build, so an upload cannot change what others get.
 */
export const RUNTIME_OBJECTS = ["verilated.o", "verilated_threads.o", "verilated_save.o"] as const;
/** Where the precompiled header folder appears inside the sandbox, and the header to pass with -include. */
export const PCH_MOUNT = "/gc-pch";
export const PCH_HEADER = `${PCH_MOUNT}/gc_pch.h`;
const PCH_FILES = ["gc_pch.h", "gc_pch.h.gch"] as const;
const VERILATOR_INCLUDE = "/usr/share/verilator/include";

const pending = new Map<string, Promise<string | null>>();

/** Verilator's runtime source and the compiler, as files on this machine: a new package version is a new entry. */
export function toolchainStamp(): string {
  const stamp = (path: string) => {
    const st = statSync(path, { throwIfNoEntry: false });
    return st ? `${Math.round(st.mtimeMs)}-${st.size}` : "none";
  };
  return [stamp(join(VERILATOR_INCLUDE, "verilated.cpp")), stamp("/usr/bin/verilator_bin"), stamp("/usr/bin/g++")].join("/");
}

function cacheKey(what: string, flags: string): string {
  // -march=native objects are only good on the processor they were built for
  return createHash("sha256").update(`${what} ${flags} ${cpus()[0]?.model ?? "unknown"} ${toolchainStamp()}`).digest("hex").slice(0, 16);
}

const TRUSTED_DESIGN = "module gc_runtime(input wire clk, output reg q);\n  always @(posedge clk) q <= !q;\nendmodule\n";
// compiled with the model's own make variables (CXXFLAGS, CPPFLAGS, OPT_FAST), so GCC accepts it for the model
const PCH_MAKEFILE = "gc_pch.h.gch: ../gc_pch.h\n\t$(CXX) $(CXXFLAGS) $(CPPFLAGS) $(OPT_FAST) -x c++-header -o $@ $<\n";

async function buildOnce(target: string, script: string, flags: string, outputs: { from: string; name: string }[]): Promise<string | null> {
  const work = mkdtempSync(join(tmpdir(), "gc-vlrt-"));
  chmodSync(work, 0o755);
  try {
    writeFileSync(join(work, "gc_runtime.v"), TRUSTED_DESIGN);
    writeFileSync(join(work, "main.cpp"), '#include "Vtop.h"\nint main() { Vtop top; top.eval(); return 0; }\n');
    writeFileSync(join(work, "gc_pch.h"), '#include "verilated.h"\n');
    writeFileSync(join(work, "gc_pch.mk"), PCH_MAKEFILE);
    const result = await runSandboxed({
      command: "/bin/sh",
      args: ["-c", `verilator --cc --exe --top-module gc_runtime --prefix Vtop -Mdir obj gc_runtime.v main.cpp && ${script}`, "sh", flags],
      buildDir: work,
      limits: { wallSeconds: 300, cpuSeconds: 300 },
    });
    if (result.exitCode !== 0) {
      console.error(`[build] could not prepare ${target}: ${result.stderr.slice(-500)}`);
      return null;
    }
    const staging = `${target}.tmp-${process.pid}`;
    rmSync(staging, { recursive: true, force: true });
    mkdirSync(staging, { recursive: true, mode: 0o755 });
    for (const o of outputs) copyFileSync(join(work, o.from), join(staging, o.name));
    rmSync(target, { recursive: true, force: true });
    renameSync(staging, target);
    return target;
  } finally {
    rmSync(work, { recursive: true, force: true });
  }
}

function once(what: string, flags: string, names: readonly string[], build: (target: string) => Promise<string | null>): Promise<string | null> {
  const target = join(tmpdir(), `gatecrash-verilator-${what}-${cacheKey(what, flags)}`);
  let p = pending.get(target);
  if (!p) {
    p = names.every((n) => existsSync(join(target, n))) ? Promise.resolve(target) : build(target);
    pending.set(target, p);
  }
  return p;
}

/**
 * Folder holding the prebuilt runtime objects, or null if they could not be built (builds then compile
 * them). `flags` are the C++ flags they are built with; a change of flags is a new cache entry.
 */
export function verilatorRuntime(flags: string): Promise<string | null> {
  return once("runtime", flags, RUNTIME_OBJECTS, (target) =>
    buildOnce(target, `make -s -C obj -f Vtop.mk -j 2 OPT_GLOBAL="$1" ${RUNTIME_OBJECTS.join(" ")}`, flags, RUNTIME_OBJECTS.map((n) => ({ from: `obj/${n}`, name: n }))),
  );
}

/**
 * Folder holding gc_pch.h and its precompiled form for model files compiled with OPT_FAST = `flags`, or null
 * (builds then parse the header themselves; the objects come out the same either way).
 */
export function verilatorPch(flags: string): Promise<string | null> {
  return once("pch", flags, PCH_FILES, (target) =>
    buildOnce(target, 'make -s -C obj -f Vtop.mk -f ../gc_pch.mk OPT_FAST="$1" gc_pch.h.gch', flags, [
      { from: "gc_pch.h", name: "gc_pch.h" },
      { from: "obj/gc_pch.h.gch", name: "gc_pch.h.gch" },
    ]),
  );
}
