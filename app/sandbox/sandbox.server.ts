import { spawn } from "node:child_process";
import type { Readable, Writable } from "node:stream";
import { chownSync, existsSync, lstatSync, readdirSync } from "node:fs";
import { join } from "node:path";

/**
 * Runs a hardware tool on untrusted input, as EDA.md prescribes: an unprivileged user, no network,
 * its own mount namespace with only the build folder writable (bubblewrap), prlimit on CPU time,
 * address space, file size and process count, and a wall-clock kill of the whole process group.
 *
 * The network stays unshared for every run, the repository fetch included: its sandbox has only its own
 * loopback. The fetch's one way out is a Unix socket in the build folder, where the worker's single-destination
 * proxy (app/sources/fetch-proxy.server.ts) listens and connects only to the one host:port of the entry's link,
 * at addresses it resolved and checked itself, counting the bytes. A relay inside the sandbox (socat) turns
 * git's proxy connection into that socket. So a fetch can reach exactly one repository host and nothing on the
 * worker's network (the database, the store, other hosts), and git sees no credentials, config or /etc.
 */
export interface SandboxLimits {
  cpuSeconds: number;
  memoryBytes: number;
  fileSizeBytes: number;
  processes: number;
  wallSeconds: number;
}

export const DEFAULT_LIMITS: SandboxLimits = {
  cpuSeconds: 120,
  memoryBytes: 4_000_000_000,
  fileSizeBytes: 500_000_000,
  processes: 256,
  wallSeconds: 180,
};

export interface SandboxRequest {
  /** Program and arguments as seen inside the sandbox (the build folder is mounted at /build). */
  command: string;
  args: string[];
  /** Host folder mounted read-write at /build; made writable by the sandbox user. */
  buildDir: string;
  limits?: Partial<SandboxLimits>;
  /** Cap on captured stdout/stderr, each; the rest is dropped and `truncated` set. */
  maxOutputBytes?: number;
  /**
   * Host folders of Gatecrash's own (never an upload's) shown read-only inside, e.g. a precompiled header, or the CA
   * certificates for the repository fetch; an `optional` one is skipped when the host has no such folder.
   */
  readOnly?: { host: string; inside: string; optional?: boolean }[];
  /**
   * Streams instead of files, for tools that hand data over as they make it: `stdin` gives the tool a pipe to read
   * (e.g. raw frames into ffmpeg), `fd3` an extra pipe the tool writes on its file descriptor 3 (e.g. the harness's
   * frames). `onStreams` receives both ends as soon as the process exists; the caller must consume `fd3`.
   */
  pipes?: { stdin?: boolean; fd3?: boolean };
  onStreams?: (io: { stdin: Writable | null; fd3: Readable | null }) => void;
}

export interface SandboxResult {
  exitCode: number | null;
  signal: NodeJS.Signals | null;
  timedOut: boolean;
  stdout: string;
  stderr: string;
  truncated: boolean;
  durationMs: number;
}

const NOBODY = 65534;

/** Hands the build folder to the sandbox user. Never follows links: a tool may have planted one pointing anywhere. */
function chownTree(dir: string, uid: number): void {
  chownSync(dir, uid, uid);
  for (const name of readdirSync(dir)) {
    const p = join(dir, name);
    const st = lstatSync(p, { throwIfNoEntry: false });
    if (!st || st.isSymbolicLink()) continue;
    if (st.isDirectory()) chownTree(p, uid);
    else if (st.isFile()) chownSync(p, uid, uid);
  }
}

export function sandboxArgv(req: SandboxRequest): string[] {
  const l = { ...DEFAULT_LIMITS, ...req.limits };
  const isRoot = process.getuid?.() === 0;
  const bind = ["/usr", "/lib", "/lib64", "/bin"].filter((p) => existsSync(p)).flatMap((p) => ["--ro-bind", p, p]);
  const bwrap = [
    "bwrap",
    ...bind,
    // Debian resolves some shared libraries (libblas, liblapack for ffmpeg) through /etc/alternatives
    "--ro-bind-try", "/etc/alternatives", "/etc/alternatives",
    "--proc", "/proc",
    "--dev", "/dev",
    "--tmpfs", "/tmp",
    "--bind", req.buildDir, "/build",
    ...(req.readOnly ?? []).flatMap((m) => [m.optional ? "--ro-bind-try" : "--ro-bind", m.host, m.inside]),
    "--unshare-all",
    "--die-with-parent",
    "--new-session",
    "--clearenv",
    "--setenv", "PATH", "/usr/bin:/bin",
    "--setenv", "HOME", "/build",
    "--setenv", "LANG", "C.UTF-8",
    "--chdir", "/build",
    req.command,
    ...req.args,
  ];
  const prlimit = [
    "prlimit",
    `--as=${l.memoryBytes}`,
    `--cpu=${l.cpuSeconds}`,
    `--fsize=${l.fileSizeBytes}`,
    `--nproc=${l.processes}`,
    "--",
  ];
  const drop = isRoot ? ["setpriv", `--reuid=${NOBODY}`, `--regid=${NOBODY}`, "--clear-groups", "--no-new-privs"] : [];
  return [...prlimit, ...drop, ...bwrap];
}

export function runSandboxed(req: SandboxRequest): Promise<SandboxResult> {
  const l = { ...DEFAULT_LIMITS, ...req.limits };
  const maxOut = req.maxOutputBytes ?? 4 * 1024 * 1024;
  if (process.getuid?.() === 0) chownTree(req.buildDir, NOBODY);
  const [bin, ...args] = sandboxArgv(req);
  const started = Date.now();
  return new Promise((resolve, reject) => {
    const child = spawn(bin, args, {
      stdio: [req.pipes?.stdin ? "pipe" : "ignore", "pipe", "pipe", ...(req.pipes?.fd3 ? (["pipe"] as const) : [])],
      detached: true,
      env: { PATH: "/usr/bin:/bin" },
    });
    if (req.onStreams) req.onStreams({ stdin: child.stdin ?? null, fd3: req.pipes?.fd3 ? (child.stdio[3] as Readable) : null });
    const out: Buffer[] = [];
    const err: Buffer[] = [];
    let outLen = 0;
    let errLen = 0;
    let truncated = false;
    let timedOut = false;
    child.stdout!.on("data", (b: Buffer) => {
      if (outLen < maxOut) out.push(b.subarray(0, maxOut - outLen));
      else truncated = true;
      outLen += b.length;
    });
    child.stderr!.on("data", (b: Buffer) => {
      if (errLen < maxOut) err.push(b.subarray(0, maxOut - errLen));
      else truncated = true;
      errLen += b.length;
    });
    const timer = setTimeout(() => {
      timedOut = true;
      // The sandbox runs in its own process group (detached): kill all of it.
      // The group may have exited a moment ago; only a live group is killed.
      if (child.pid && child.exitCode === null) {
        try {
          process.kill(-child.pid, "SIGKILL");
        } catch (e) {
          if ((e as NodeJS.ErrnoException).code !== "ESRCH") throw e;
        }
      }
    }, l.wallSeconds * 1000);
    child.on("error", (e) => {
      clearTimeout(timer);
      reject(new Error(`sandbox could not start ${bin}: ${e.message}`));
    });
    child.on("close", (exitCode, signal) => {
      clearTimeout(timer);
      resolve({
        exitCode,
        signal,
        timedOut,
        stdout: Buffer.concat(out).toString("utf8"),
        stderr: Buffer.concat(err).toString("utf8"),
        truncated,
        durationMs: Date.now() - started,
      });
    });
  });
}
