/**
 * `npm run restore -- FOLDER`: puts a backup made by `npm run backup` into an EMPTY database (DATABASE_URL) and an
 * empty bucket (S3_BUCKET, created when missing), then checks every table's row count and every object's SHA-256
 * against the manifest. It refuses a database that has tables or a bucket that has objects.
 */
import { spawnSync } from "node:child_process";
import { existsSync, readFileSync } from "node:fs";
import { join, resolve } from "node:path";
import { CreateBucketCommand, GetObjectCommand, HeadBucketCommand, ListObjectsV2Command, PutObjectCommand } from "@aws-sdk/client-s3";
import postgres from "postgres";
import { env } from "~/env.server";
import { postgresBinDir } from "./lib/system-deps";
import { rowCounts, sha256, storageClient, tableNames, type BackupManifest } from "./lib/backup-format";
import { useLocalSecretsIfPresent } from "./lib/secrets";

async function main(): Promise<number> {
  // Against a running `npm start`: its generated secrets (the S3 fake's keys).
  useLocalSecretsIfPresent(".gatecrash/secrets.json");
  const folder = process.argv.slice(2).find((a) => !a.startsWith("--"));
  if (!folder) {
    console.error("usage: npm run restore -- FOLDER");
    return 2;
  }
  const dir = resolve(folder);
  if (!existsSync(join(dir, "manifest.json"))) {
    console.error(`restore: no manifest.json in ${dir}`);
    return 2;
  }
  const manifest = JSON.parse(readFileSync(join(dir, "manifest.json"), "utf8")) as BackupManifest;
  if (manifest.format !== "gatecrash-backup/1") {
    console.error(`restore: unknown backup format ${String(manifest.format)}`);
    return 2;
  }
  const e = env();

  // Every object file must still match its hash before anything is written.
  for (const o of manifest.objects) {
    const got = sha256(readFileSync(join(dir, o.file)));
    if (got !== o.sha256) throw new Error(`object ${o.key}: file ${o.file} is damaged (sha256 ${got}, manifest ${o.sha256})`);
  }

  const sql = postgres(e.DATABASE_URL, { max: 1, onnotice: () => {} });
  const existing = await tableNames(sql);
  if (existing.length) {
    await sql.end({ timeout: 5 });
    console.error(`restore: the database already has ${existing.length} tables; restore only into an empty database`);
    return 3;
  }
  const s3 = storageClient(e);
  const bucketExists = await s3.send(new HeadBucketCommand({ Bucket: e.S3_BUCKET })).then(
    () => true,
    (err: { name?: string; $metadata?: { httpStatusCode?: number } }) => {
      if (err.name === "NotFound" || err.$metadata?.httpStatusCode === 404) return false;
      throw err;
    },
  );
  if (!bucketExists) await s3.send(new CreateBucketCommand({ Bucket: e.S3_BUCKET }));
  const present = await s3.send(new ListObjectsV2Command({ Bucket: e.S3_BUCKET, MaxKeys: 1 }));
  if ((present.Contents ?? []).length) {
    await sql.end({ timeout: 5 });
    console.error(`restore: bucket ${e.S3_BUCKET} is not empty; restore only into an empty bucket`);
    return 3;
  }

  const res = spawnSync(join(postgresBinDir(), "pg_restore"), ["--no-owner", "--no-privileges", "--exit-on-error", "--dbname", e.DATABASE_URL, join(dir, manifest.database.file)], { encoding: "utf8" });
  if (res.status !== 0) throw new Error(`pg_restore failed: ${res.stderr}`);

  for (const o of manifest.objects) {
    await s3.send(new PutObjectCommand({ Bucket: e.S3_BUCKET, Key: o.key, Body: readFileSync(join(dir, o.file)), ContentType: o.contentType ?? undefined }));
  }

  // Verify: row counts as in the snapshot of the backup, every object's bytes as hashed then.
  const counts = await rowCounts(sql);
  await sql.end({ timeout: 5 });
  const wrong = Object.entries(manifest.database.tables).filter(([t, n]) => counts[t] !== n);
  for (const o of manifest.objects) {
    const got = await s3.send(new GetObjectCommand({ Bucket: e.S3_BUCKET, Key: o.key }));
    const hash = sha256(await got.Body!.transformToByteArray());
    if (hash !== o.sha256) wrong.push([`object ${o.key}`, -1]);
  }
  if (wrong.length) {
    console.error(`restore: mismatches after restore: ${wrong.map(([t]) => t).join(", ")}`);
    return 4;
  }
  console.log(`restore: ${Object.keys(counts).length} tables and ${manifest.objects.length} objects restored and verified from ${dir}`);
  return 0;
}

main().then(
  (code) => process.exit(code),
  (err: unknown) => {
    console.error(`restore failed: ${err instanceof Error ? err.message : String(err)}`);
    process.exit(1);
  },
);
