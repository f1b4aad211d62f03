import { chmodSync, copyFileSync, existsSync, mkdirSync, mkdtempSync, renameSync, rmSync, statSync, writeFileSync } from "node:fs";
import { createHash } from "node:crypto";
import { cpus, tmpdir } from "node:os";
import { join } from "node:path";
import { runSandboxed } from "~/sandbox/sandbox.server";

/**
 * Verilator's runtime library (verilated.o, verilated_threads.o) takes most of a build's time and never
 * depends on the design. It is compiled once, from a built-in trusted design, and copied into each build.
 * Nothing is ever copied back from an entrant's build, so an upload cannot change what others get.
 */
export const RUNTIME_OBJECTS = ["verilated.o", "verilated_threads.o"] as const;
const VERILATOR_INCLUDE = "/usr/share/verilator/include";

let pending: Promise<string | null> | null = null;

function cacheKey(flags: string): string {
  const st = statSync(join(VERILATOR_INCLUDE, "verilated.cpp"));
  // -march=native objects are only good on the processor they were built for
  const target = `${flags} ${cpus()[0]?.model ?? "unknown"}`;
  return `${Math.round(st.mtimeMs)}-${st.size}-${createHash("sha256").update(target).digest("hex").slice(0, 8)}`;
}

async function build(target: string, flags: string): Promise<string | null> {
  const work = mkdtempSync(join(tmpdir(), "gc-vlrt-"));
  chmodSync(work, 0o755);
  try {
    writeFileSync(join(work, "gc_runtime.v"), "module gc_runtime(input wire clk, output reg q);\n  always @(posedge clk) q <= !q;\nendmodule\n");
    writeFileSync(join(work, "main.cpp"), '#include "Vtop.h"\nint main() { Vtop top; top.eval(); return 0; }\n');
    const result = await runSandboxed({
      command: "/bin/sh",
      args: ["-c", 'verilator --cc --exe --top-module gc_runtime --prefix Vtop -Mdir obj gc_runtime.v main.cpp && make -s -C obj -f Vtop.mk -j 2 OPT_GLOBAL="$1" verilated.o verilated_threads.o', "sh", flags],
      buildDir: work,
      limits: { wallSeconds: 300, cpuSeconds: 300 },
    });
    if (result.exitCode !== 0) return null;
    const staging = `${target}.tmp-${process.pid}`;
    mkdirSync(staging, { recursive: true });
    for (const name of RUNTIME_OBJECTS) copyFileSync(join(work, "obj", name), join(staging, name));
    rmSync(target, { recursive: true, force: true });
    renameSync(staging, target);
    return target;
  } finally {
    rmSync(work, { recursive: true, force: true });
  }
}

/**
 * Folder holding the prebuilt runtime objects, or null if they could not be built (builds then compile
 * them). `flags` are the C++ flags they are built with; a change of flags is a new cache entry.
 */
export function verilatorRuntime(flags: string): Promise<string | null> {
  if (!pending) {
    const target = join(tmpdir(), `gatecrash-verilator-runtime-${cacheKey(flags)}`);
    pending = RUNTIME_OBJECTS.every((n) => existsSync(join(target, n))) ? Promise.resolve(target) : build(target, flags);
  }
  return pending;
}
