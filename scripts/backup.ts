/**
 * `npm run backup [-- --out FOLDER]`: a consistent copy of Gatecrash's data into a new timestamped folder
 * (default `.gatecrash/backups/<UTC timestamp>`): pg_dump of DATABASE_URL, taken in one exported snapshot in which
 * every table's rows are also counted, and every object of the S3 bucket with its SHA-256 (manifest.json).
 * Restore with `npm run restore -- FOLDER`.
 */
import { spawnSync } from "node:child_process";
import { existsSync, mkdirSync, writeFileSync } from "node:fs";
import { join, resolve } from "node:path";
import { GetObjectCommand, ListObjectsV2Command } from "@aws-sdk/client-s3";
import postgres from "postgres";
import { env } from "~/env.server";
import { postgresBinDir } from "./lib/system-deps";
import { rowCounts, sha256, storageClient, type BackupManifest } from "./lib/backup-format";
import { useLocalSecretsIfPresent } from "./lib/secrets";

function arg(name: string): string | undefined {
  const i = process.argv.indexOf(name);
  return i >= 0 ? process.argv[i + 1] : undefined;
}

async function main(): Promise<number> {
  // Against a running `npm start`: its generated secrets (the S3 fake's keys).
  useLocalSecretsIfPresent(".gatecrash/secrets.json");
  const e = env();
  const stamp = new Date().toISOString().replace(/[:.]/g, "-");
  const dir = resolve(arg("--out") ?? join(".gatecrash", "backups", stamp));
  if (existsSync(join(dir, "manifest.json"))) {
    console.error(`backup: ${dir} already holds a backup; choose another folder`);
    return 2;
  }
  mkdirSync(join(dir, "objects"), { recursive: true });

  // One snapshot for the dump and the row counts: writes that land meanwhile are in neither.
  const sql = postgres(e.DATABASE_URL, { max: 1, onnotice: () => {} });
  let tables: Record<string, number> = {};
  const dumpFile = "database.dump";
  await sql.begin("isolation level repeatable read read only", async (tx) => {
    const [{ snapshot }] = await tx<{ snapshot: string }[]>`select pg_export_snapshot() as snapshot`;
    tables = await rowCounts(tx);
    const dump = spawnSync(join(postgresBinDir(), "pg_dump"), ["--format=custom", "--no-owner", "--no-privileges", `--snapshot=${snapshot}`, "--file", join(dir, dumpFile), e.DATABASE_URL], {
      encoding: "utf8",
    });
    if (dump.status !== 0) throw new Error(`pg_dump failed: ${dump.stderr}`);
  });
  await sql.end({ timeout: 5 });

  const s3 = storageClient(e);
  const objects: BackupManifest["objects"] = [];
  let token: string | undefined;
  do {
    const page = await s3.send(new ListObjectsV2Command({ Bucket: e.S3_BUCKET, ContinuationToken: token }));
    for (const o of page.Contents ?? []) {
      if (!o.Key) continue;
      const got = await s3.send(new GetObjectCommand({ Bucket: e.S3_BUCKET, Key: o.Key }));
      const bytes = await got.Body!.transformToByteArray();
      const hash = sha256(bytes);
      const file = join("objects", hash);
      if (!existsSync(join(dir, file))) writeFileSync(join(dir, file), bytes);
      objects.push({ key: o.Key, sha256: hash, size: bytes.length, contentType: got.ContentType ?? null, file });
    }
    token = page.IsTruncated ? page.NextContinuationToken : undefined;
  } while (token);

  const manifest: BackupManifest = { format: "gatecrash-backup/1", createdAt: new Date().toISOString(), database: { file: dumpFile, tables }, bucket: e.S3_BUCKET, objects };
  writeFileSync(join(dir, "manifest.json"), JSON.stringify(manifest, null, 2));
  const rows = Object.values(tables).reduce((a, b) => a + b, 0);
  console.log(`backup: ${Object.keys(tables).length} tables (${rows} rows) and ${objects.length} objects in ${dir}`);
  console.log(dir);
  return 0;
}

main().then(
  (code) => process.exit(code),
  (err: unknown) => {
    console.error(`backup failed: ${err instanceof Error ? err.message : String(err)}`);
    process.exit(1);
  },
);
