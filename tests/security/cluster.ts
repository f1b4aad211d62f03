import { join } from "node:path";
import { tmpdir } from "node:os";
import { mkdtempSync, rmSync } from "node:fs";
import { spawnSync } from "node:child_process";
import { clusterFor, createDatabase, initCluster, isRunning, startCluster, stopCluster, type Cluster } from "../../scripts/lib/postgres";
import { applyMigrations } from "../../scripts/lib/migrate";
import { freePort } from "../../scripts/lib/ports";

/**
 * A PostgreSQL cluster of a test's own (initdb in the test's temporary folder), for tests that stop the server or
 * need an empty database: the shared test cluster keeps serving the test files running beside them.
 */
export interface PrivateCluster {
  cluster: Cluster;
  url(database: string): string;
  newDatabase(name: string, migrate?: boolean): Promise<string>;
  stop(): void;
  start(): void;
  destroy(): void;
}

export async function privateCluster(name: string): Promise<PrivateCluster> {
  const base = process.env.TEST_ROOT ?? tmpdir();
  const root = mkdtempSync(join(base, `${name}-`));
  spawnSync("chmod", ["755", root]);
  const cluster = clusterFor(join(root, "pg"), await freePort());
  initCluster(cluster);
  startCluster(cluster);
  return {
    cluster,
    url: (db) => cluster.url(db),
    async newDatabase(db, migrate = true) {
      createDatabase(cluster, db);
      const url = cluster.url(db);
      if (migrate) await applyMigrations(url);
      return url;
    },
    stop: () => stopCluster(cluster),
    start: () => {
      if (!isRunning(cluster)) startCluster(cluster);
    },
    destroy: () => {
      stopCluster(cluster);
      rmSync(root, { recursive: true, force: true });
    },
  };
}
