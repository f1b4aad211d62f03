/**
 * `npm test`: the whole suite, starting what it needs itself and never touching the demo data.
 * Its own PostgreSQL cluster in a temporary folder, its own fakes on free ports, a fresh build of the app;
 * then unit + integration tests (vitest, including supertest against the built request listener),
 * then the Playwright e2e suite in Debian's Chromium against the built server and the worker.
 * Pass vitest filters after `--`: `npm test -- app/gdsii` runs only those (and skips e2e unless asked with --e2e).
 * E2E_FILTER=tests/e2e/repository narrows the browser suite the same way.
 */
import { spawnSync } from "node:child_process";
import { mkdtempSync, rmSync } from "node:fs";
import { tmpdir } from "node:os";
import { basename, join, resolve } from "node:path";
import { ensureDebianPackages, RUNTIME_PACKAGES, TEST_PACKAGES } from "./lib/system-deps";
import { clusterFor, createDatabase, initCluster, startCluster, stopCluster } from "./lib/postgres";
import { applyMigrations } from "./lib/migrate";
import { freePort } from "./lib/ports";
import { localSecrets } from "./lib/secrets";
import { appEnv, startStack } from "./lib/stack";

const args = process.argv.slice(2);
const filters = args.filter((a) => !a.startsWith("--"));
const runE2e = filters.length === 0 || args.includes("--e2e");

function run(what: string, cmd: string, argv: string[], env: NodeJS.ProcessEnv): boolean {
  console.log(`\n=== ${what} ===`);
  const res = spawnSync(cmd, argv, { stdio: "inherit", env });
  return res.status === 0;
}

async function main(): Promise<number> {
  ensureDebianPackages({ ...RUNTIME_PACKAGES, ...TEST_PACKAGES });
  const root = mkdtempSync(join(tmpdir(), "gatecrash-test-"));
  // The test cluster's folder must be reachable by the postgres user.
  spawnSync("chmod", ["755", root]);
  const cluster = clusterFor(join(root, "pg"), await freePort());
  const buildDir = resolve(".gatecrash", `test-build-${basename(root)}`);
  initCluster(cluster);
  startCluster(cluster);
  const stops: (() => Promise<void>)[] = [];
  try {
    createDatabase(cluster, "gatecrash_test");
    const databaseUrl = cluster.url("gatecrash_test");
    await applyMigrations(databaseUrl);
    const ports = { web: await freePort(), s3: await freePort(), smtp: await freePort(), mailWeb: await freePort(), payments: await freePort() };
    const env: NodeJS.ProcessEnv = {
      ...appEnv(ports, databaseUrl, join(root, "data")),
      // This run's own secrets: the web server runs as in production, which refuses the committed defaults.
      ...localSecrets(),
      NODE_ENV: "test",
      MAIL_API_URL: `http://127.0.0.1:${ports.mailWeb}`,
      PAYMENTS_FAKE_URL: `http://127.0.0.1:${ports.payments}`,
      TEST_PG_DATA: cluster.dataDir,
      TEST_PG_PORT: String(cluster.port),
      TEST_ROOT: root,
      // the tests serve their own git repositories on 127.0.0.1 for the repository fetch
      REPOSITORY_FETCH_LOOPBACK: "allow",
      // Inside the project, so the built server resolves node_modules; one folder per run.
      GATECRASH_BUILD_DIR: buildDir,
    };
    const fakes = await startStack({ ports, dataDir: join(root, "data"), env, services: ["s3", "mail", "payments"], quiet: true });
    stops.push(fakes.stop);

    if (!run("build", process.execPath, ["node_modules/@react-router/dev/bin.js", "build"], { ...env, NODE_ENV: "production" })) return 1;
    let ok = run("unit and integration tests (vitest)", process.execPath, ["node_modules/vitest/vitest.mjs", "run", ...filters], env);

    if (runE2e) {
      const app = await startStack({ ports, dataDir: join(root, "data"), env, services: ["worker", "web"], quiet: !process.env.E2E_VERBOSE });
      stops.push(app.stop);
      ok = run("end-to-end tests (Playwright in Chromium)", process.execPath, ["node_modules/vitest/vitest.mjs", "run", "--config", "tests/e2e/vitest.config.ts", ...(process.env.E2E_FILTER?.split(/\s+/).filter(Boolean) ?? [])], env) && ok;
    }
    return ok ? 0 : 1;
  } finally {
    for (const stop of stops.reverse()) await stop();
    stopCluster(cluster);
    rmSync(root, { recursive: true, force: true });
    rmSync(buildDir, { recursive: true, force: true });
  }
}

main().then(
  (code) => process.exit(code),
  (e: unknown) => {
    console.error(e instanceof Error ? e.stack : e);
    process.exit(1);
  },
);
