import { spawn, type ChildProcess } from "node:child_process";

/** Child processes of a Gatecrash stack, with prefixed output and an orderly stop. */
export interface Proc {
  name: string;
  child: ChildProcess;
  exited: Promise<number | null>;
}

export function startProc(name: string, cmd: string, args: string[], env: NodeJS.ProcessEnv, opts: { quiet?: boolean } = {}): Proc {
  const child = spawn(cmd, args, { env, stdio: ["ignore", "pipe", "pipe"] });
  const prefix = (chunk: Buffer) =>
    chunk
      .toString()
      .split("\n")
      .filter((l) => l.trim())
      .map((l) => `[${name}] ${l}`)
      .join("\n");
  child.stdout?.on("data", (c: Buffer) => !opts.quiet && console.log(prefix(c)));
  child.stderr?.on("data", (c: Buffer) => !opts.quiet && console.error(prefix(c)));
  const exited = new Promise<number | null>((resolve) => child.on("exit", (code) => resolve(code)));
  return { name, child, exited };
}

export async function stopProcs(procs: Proc[], timeoutMs = 10_000): Promise<void> {
  await Promise.all(
    procs.map(async (p) => {
      if (p.child.exitCode !== null || p.child.signalCode !== null) return;
      p.child.kill("SIGTERM");
      const timer = setTimeout(() => p.child.kill("SIGKILL"), timeoutMs);
      await p.exited;
      clearTimeout(timer);
    }),
  );
}
