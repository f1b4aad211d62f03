import { spawn, type ChildProcess } from "node:child_process";
import { join } from "node:path";
import { createDatabase, clusterFor } from "../../scripts/lib/postgres";
import { applyMigrations } from "../../scripts/lib/migrate";
import { freePort, waitForPort } from "../../scripts/lib/ports";

/**
 * Processes and databases of a test's own, for crash tests: a fresh database in the shared test cluster (its own
 * pg-boss schema, so a worker started here never takes another test file's jobs), a worker process, a maildev.
 */
export async function ownDatabase(name: string): Promise<string> {
  const data = process.env.TEST_PG_DATA;
  const port = Number(process.env.TEST_PG_PORT);
  if (!data || !port) throw new Error("TEST_PG_DATA/TEST_PG_PORT are not set: run the tests through `npm test`");
  const cluster = clusterFor(data, port);
  const db = `${name}_${process.pid}`;
  createDatabase(cluster, db);
  const url = cluster.url(db);
  await applyMigrations(url);
  return url;
}

export interface Child {
  child: ChildProcess;
  output: string[];
  exited: Promise<number | null>;
  /** SIGKILL to the whole process group: the worker and whatever it started, as a power cut would. */
  kill(): Promise<void>;
  stop(): Promise<void>;
}

function track(child: ChildProcess): Child {
  const output: string[] = [];
  child.stdout?.on("data", (c: Buffer) => output.push(c.toString()));
  child.stderr?.on("data", (c: Buffer) => output.push(c.toString()));
  const exited = new Promise<number | null>((resolve) => child.on("exit", (code) => resolve(code)));
  const signalGroup = (sig: NodeJS.Signals) => {
    if (child.exitCode === null && child.signalCode === null && child.pid) process.kill(-child.pid, sig);
  };
  return {
    child,
    output,
    exited,
    async kill() {
      signalGroup("SIGKILL");
      await exited;
    },
    async stop() {
      signalGroup("SIGTERM");
      const timer = setTimeout(() => signalGroup("SIGKILL"), 10_000);
      await exited;
      clearTimeout(timer);
    },
  };
}

export function startWorker(env: NodeJS.ProcessEnv): Child {
  // One process (no tsx launcher in between), in its own process group.
  return track(spawn(process.execPath, ["--import", "tsx", "app/worker.server.ts"], { env, detached: true, stdio: ["ignore", "pipe", "pipe"] }));
}

export async function startMaildev(smtpPort: number, webPort?: number): Promise<{ proc: Child; apiUrl: string }> {
  const web = webPort ?? (await freePort());
  const proc = track(
    spawn(process.execPath, [join("node_modules/maildev/dist/bin/maildev.js"), "--ip", "127.0.0.1", "--smtp", String(smtpPort), "--web-ip", "127.0.0.1", "--web", String(web), "--silent"], {
      detached: true,
      stdio: ["ignore", "pipe", "pipe"],
    }),
  );
  await waitForPort(smtpPort, 30_000);
  await waitForPort(web, 30_000);
  return { proc, apiUrl: `http://127.0.0.1:${web}` };
}

/** Polls `read` until it returns a value `ok` accepts, or fails after the deadline (no fixed sleeps). */
export async function until<T>(what: string, read: () => Promise<T>, ok: (v: T) => boolean, timeoutMs: number, everyMs = 250): Promise<T> {
  const end = Date.now() + timeoutMs;
  let last: T | undefined;
  while (Date.now() < end) {
    last = await read();
    if (ok(last)) return last;
    await new Promise((r) => setTimeout(r, everyMs));
  }
  throw new Error(`timed out after ${timeoutMs} ms waiting for ${what}; last value: ${JSON.stringify(last)}`);
}
