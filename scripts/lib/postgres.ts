import { execFileSync, spawnSync } from "node:child_process";
import { chmodSync, chownSync, existsSync, mkdirSync, readFileSync } from "node:fs";
import { join, resolve } from "node:path";
import { postgresBinDir } from "./system-deps";

/**
 * A PostgreSQL cluster owned by the project, in a folder of its own, listening on 127.0.0.1 only,
 * its socket inside the data folder (STACK.md). As root, the server runs as the `postgres` user.
 */
export interface Cluster {
  dataDir: string;
  port: number;
  user: string;
  url(database: string): string;
}

export function asPostgres(bin: string, args: string[]): string[] {
  return process.getuid?.() === 0 ? ["runuser", "-u", "postgres", "--", bin, ...args] : [bin, ...args];
}

function run(argv: string[], what: string): void {
  const [cmd, ...rest] = argv;
  const res = spawnSync(cmd, rest, { encoding: "utf8" });
  if (res.status !== 0) throw new Error(`${what} failed:\n${res.stdout}\n${res.stderr}`);
}

export function clusterFor(dataDir: string, port: number): Cluster {
  const user = "gatecrash";
  return { dataDir: resolve(dataDir), port, user, url: (db) => `postgres://${user}@127.0.0.1:${port}/${db}` };
}

export function isRunning(cluster: Cluster): boolean {
  const [cmd, ...args] = asPostgres(join(postgresBinDir(), "pg_ctl"), ["-D", cluster.dataDir, "status"]);
  return spawnSync(cmd, args).status === 0;
}

/** Port a previous start recorded in the data folder. */
export function recordedPort(dataDir: string): number | null {
  const opts = join(dataDir, "gatecrash.port");
  return existsSync(opts) ? Number(readFileSync(opts, "utf8").trim()) : null;
}

export function initCluster(cluster: Cluster): void {
  if (existsSync(join(cluster.dataDir, "PG_VERSION"))) return;
  mkdirSync(cluster.dataDir, { recursive: true });
  if (process.getuid?.() === 0) {
    const uid = Number(execFileSync("id", ["-u", "postgres"], { encoding: "utf8" }).trim());
    const gid = Number(execFileSync("id", ["-g", "postgres"], { encoding: "utf8" }).trim());
    chownSync(cluster.dataDir, uid, gid);
  }
  chmodSync(cluster.dataDir, 0o700);
  const bin = join(postgresBinDir(), "initdb");
  run(asPostgres(bin, ["-D", cluster.dataDir, "-U", cluster.user, "--auth=trust", "-E", "UTF8", "--locale=C.UTF-8"]), "initdb");
}

export function startCluster(cluster: Cluster): void {
  const bin = join(postgresBinDir(), "pg_ctl");
  const opts = `-c listen_addresses=127.0.0.1 -p ${cluster.port} -k ${cluster.dataDir} -c fsync=on`;
  run(
    asPostgres(bin, ["-D", cluster.dataDir, "-l", join(cluster.dataDir, "server.log"), "-w", "-t", "30", "-o", opts, "start"]),
    "pg_ctl start",
  );
  // Record the port so the next start reuses it (the data folder is git-ignored).
  run(asPostgres("/bin/sh", ["-c", `echo ${cluster.port} > '${join(cluster.dataDir, "gatecrash.port")}'`]), "record port");
}

export function stopCluster(cluster: Cluster): void {
  const [cmd, ...args] = asPostgres(join(postgresBinDir(), "pg_ctl"), ["-D", cluster.dataDir, "-m", "fast", "-w", "-t", "30", "stop"]);
  spawnSync(cmd, args, { stdio: "ignore" });
}

export function createDatabase(cluster: Cluster, name: string): void {
  const psql = join(postgresBinDir(), "psql");
  const exists = spawnSync(psql, ["-h", "127.0.0.1", "-p", String(cluster.port), "-U", cluster.user, "-d", "postgres", "-tAc", `SELECT 1 FROM pg_database WHERE datname='${name}'`], { encoding: "utf8" });
  if (exists.status !== 0) throw new Error(`psql failed: ${exists.stderr}`);
  if (exists.stdout.trim() === "1") return;
  run([psql, "-h", "127.0.0.1", "-p", String(cluster.port), "-U", cluster.user, "-d", "postgres", "-c", `CREATE DATABASE "${name}"`], `create database ${name}`);
}
