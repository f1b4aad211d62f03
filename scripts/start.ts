/**
 * `npm start`: the whole product on this machine, with demo data.
 * Installs missing Debian packages, starts PostgreSQL on 127.0.0.1 in .gatecrash/pg, applies migrations,
 * starts the S3 fake, SMTP catcher and payments fake, seeds the demo once, then the worker and the web server.
 * Ctrl-C stops everything, PostgreSQL included; data stays in .gatecrash/ for the next start.
 */
import { spawnSync } from "node:child_process";
import { existsSync, mkdirSync, readFileSync, rmSync, statSync, writeFileSync, readdirSync } from "node:fs";
import { join } from "node:path";
import { ensureDebianPackages, RUNTIME_PACKAGES } from "./lib/system-deps";
import { clusterFor, createDatabase, initCluster, isRunning, recordedPort, startCluster, stopCluster } from "./lib/postgres";
import { applyMigrations } from "./lib/migrate";
import { pickPort } from "./lib/ports";
import { localSecrets } from "./lib/secrets";
import { sharedStateHome } from "./lib/state-home";
import { appEnv, startStack } from "./lib/stack";

const STATE = ".gatecrash";
const LOCK = join(STATE, "start.json");

function alive(pid: number): boolean {
  try {
    process.kill(pid, 0);
    return true;
  } catch {
    return false;
  }
}

function refuseSecondStart(): void {
  if (!existsSync(LOCK)) return;
  const lock = JSON.parse(readFileSync(LOCK, "utf8")) as { pid: number; web: string };
  if (alive(lock.pid)) {
    console.error(`Gatecrash is already running (process ${lock.pid}) at ${lock.web}.\nStop it with Ctrl-C in its terminal (or kill ${lock.pid}) before starting it again.`);
    process.exit(1);
  }
  rmSync(LOCK);
}

function newestMtime(dir: string): number {
  let newest = 0;
  for (const name of readdirSync(dir, { withFileTypes: true })) {
    const p = join(dir, name.name);
    newest = Math.max(newest, name.isDirectory() ? newestMtime(p) : statSync(p).mtimeMs);
  }
  return newest;
}

function buildIfStale(): void {
  const out = "build/server/index.js";
  if (existsSync(out) && statSync(out).mtimeMs > Math.max(newestMtime("app"), newestMtime("public"))) return;
  console.log("Building the web app (react-router build)…");
  const res = spawnSync(process.execPath, ["node_modules/@react-router/dev/bin.js", "build"], { stdio: "inherit" });
  if (res.status !== 0) throw new Error("react-router build failed; see above");
}

async function main() {
  refuseSecondStart();
  mkdirSync(STATE, { recursive: true });
  ensureDebianPackages(RUNTIME_PACKAGES);

  // PostgreSQL and the sandbox run as other users: a checkout they cannot enter keeps that state under /var/lib/gatecrash
  const shared = sharedStateHome(STATE);
  if (shared.movedBecause) console.log(`PostgreSQL's data and the worker's scratch folder are in ${shared.dir}, because ${shared.movedBecause}; to start over, delete that folder as well as .gatecrash/.`);
  const pgDir = join(shared.dir, "pg");
  const pgPort = recordedPort(pgDir) ?? (await pickPort(Number(process.env.GATECRASH_PG_PORT ?? 54329)));
  const cluster = clusterFor(pgDir, pgPort);
  initCluster(cluster);
  if (!isRunning(cluster)) startCluster(cluster);
  createDatabase(cluster, "gatecrash");
  const databaseUrl = cluster.url("gatecrash");
  await applyMigrations(databaseUrl);

  const ports = {
    web: await pickPort(Number(process.env.PORT ?? 3000)),
    s3: await pickPort(4569),
    smtp: await pickPort(1025),
    mailWeb: await pickPort(1080),
    payments: await pickPort(12111),
  };
  // Generated once into .gatecrash/secrets.json and kept: the web server runs as in production, which refuses
  // the repository's development defaults.
  const env: NodeJS.ProcessEnv = { ...appEnv(ports, databaseUrl, STATE), ...localSecrets(join(STATE, "secrets.json")) };
  if (shared.movedBecause) env.WORKDIR = join(shared.dir, "work");
  writeFileSync(LOCK, JSON.stringify({ pid: process.pid, web: env.APP_URL }));

  buildIfStale();
  const fakes = await startStack({ ports, dataDir: STATE, env, services: ["s3", "mail", "payments"] });

  const seed = spawnSync(process.execPath, ["node_modules/tsx/dist/cli.mjs", "scripts/seed.ts"], { stdio: "inherit", env });
  if (seed.status !== 0) console.error("Seeding the demo failed (see above); the app starts anyway.");

  const app = await startStack({ ports, dataDir: STATE, env, services: ["worker", "web"] });

  let stopping = false;
  const shutdown = async () => {
    if (stopping) return;
    stopping = true;
    console.log("\nStopping Gatecrash…");
    await app.stop();
    await fakes.stop();
    stopCluster(cluster);
    rmSync(LOCK, { force: true });
    console.log(`Stopped. Data is kept in .gatecrash/${shared.movedBecause ? ` and ${shared.dir}` : ""} for the next start.`);
    process.exit(0);
  };
  process.on("SIGINT", () => void shutdown());
  process.on("SIGTERM", () => void shutdown());
  for (const p of [...app.procs, ...fakes.procs]) {
    void p.exited.then((code) => {
      if (!stopping) {
        console.error(`[${p.name}] exited with code ${code}; stopping the rest.`);
        void shutdown();
      }
    });
  }

  console.log(`
Gatecrash is running.
  Web app          ${env.APP_URL}
  Mail catcher     http://127.0.0.1:${ports.mailWeb}   (every mail Gatecrash sends lands here)
  Payments fake    http://127.0.0.1:${ports.payments}  (test payment pages; no money moves)
  S3 fake          ${env.S3_ENDPOINT}   (bucket ${env.S3_BUCKET ?? "gatecrash"})
  PostgreSQL       ${databaseUrl}
Demo accounts (password for all: gatecrash-demo): organizer@voltagedrop.test, judge1@voltagedrop.test,
  entrant1@voltagedrop.test, audience1@voltagedrop.test, admin@gatecrash.test — see README.md.
Press Ctrl-C to stop everything.`);
}

main().catch((e: unknown) => {
  console.error(e instanceof Error ? e.message : e);
  process.exit(1);
});
