import { constants } from "node:os";

interface FinishedRun {
  exitCode: number | null;
  signal: NodeJS.Signals | null;
}

/**
 * The signal that ended a sandboxed tool, if one did. bubblewrap reports a child killed by a signal
 * as exit status 128 + N (the shell convention), so the result's own `signal` stays null then.
 */
export function terminationSignal(run: FinishedRun): string | null {
  if (run.signal) return run.signal;
  if (run.exitCode === null || run.exitCode <= 128 || run.exitCode > 128 + 64) return null;
  const number = run.exitCode - 128;
  const name = Object.entries(constants.signals).find(([, n]) => n === number)?.[0];
  return name ?? `signal ${number}`;
}

/** The sandbox itself could not start the tool (fork refused, mount failed): Gatecrash's fault, not the entry's. */
export class SandboxStartError extends Error {
  constructor(message: string) {
    super(message);
    this.name = "SandboxStartError";
  }
}

export function assertSandboxStarted(run: { stderr: string; exitCode: number | null }): void {
  const line = run.stderr.split("\n").find((l) => l.startsWith("bwrap: ") || l.startsWith("prlimit: ") || l.startsWith("setpriv: "));
  if (line && run.exitCode !== 0) throw new SandboxStartError(`the sandbox could not start the tool: ${line}`);
}
