import { spawn } from "node:child_process";
import { chmodSync, existsSync, mkdtempSync, readFileSync, rmSync } from "node:fs";
import { join } from "node:path";
import { tmpdir } from "node:os";
import { randomBytes } from "node:crypto";
import { GetObjectCommand, ListObjectsV2Command } from "@aws-sdk/client-s3";
import postgres from "postgres";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { clusterFor, createDatabase } from "../../scripts/lib/postgres";
import { freePort } from "../../scripts/lib/ports";
import { rowCounts, sha256, storageClient, type BackupManifest } from "../../scripts/lib/backup-format";
import { startS3Fake } from "../../fakes/s3/server";
import { ownDatabase } from "../security/services";

/**
 * `npm run backup` and `npm run restore` as a round trip, run as the real CLIs: a database and a bucket of this
 * test's own with data in them → backup folder → an empty database and an empty bucket → every table's row count
 * and every object's SHA-256 (node:crypto, FIPS 180-4) compared with the source.
 */
const root = mkdtempSync(join(process.env.TEST_ROOT ?? tmpdir(), "backup-"));
chmodSync(root, 0o755);
let s3: { close(): Promise<void> };
let s3Port = 0;
let sourceUrl = "";
let closeDb: () => Promise<void>;

beforeAll(async () => {
  s3Port = await freePort();
  s3 = await startS3Fake({ port: s3Port, directory: join(root, "s3"), bucket: "gc-source", keys: { accessKeyId: process.env.S3_ACCESS_KEY_ID ?? "S3RVER", secretAccessKey: process.env.S3_SECRET_ACCESS_KEY ?? "S3RVER" } });
  sourceUrl = await ownDatabase("gatecrash_backup_src");
  process.env.DATABASE_URL = sourceUrl;
  process.env.S3_ENDPOINT = `http://127.0.0.1:${s3Port}`;
  process.env.S3_BUCKET = "gc-source";
  // Data made the way the app makes it.
  const users = await import("../support/users");
  const { makeCompetitionWithEntry, makeCompleteUpload } = await import("../support/entries");
  const { putObject } = await import("~/storage/s3.server");
  const event = await users.makeEvent("Backup Party");
  const captain = await users.makeUser({ name: "Archivist" });
  const made = await makeCompetitionWithEntry({ eventId: event.id, captainId: captain.id });
  await makeCompleteUpload(made.entry.id, 1, [
    { kind: "bundle", bytes: randomBytes(3000), filename: "a.zip", mediaType: "application/zip" },
    { kind: "layout", bytes: randomBytes(7000), filename: "a.gds", mediaType: "application/vnd.gdsii" },
  ]);
  await putObject("artifacts/same-bytes-1", "twice the same body", "text/plain");
  await putObject("artifacts/same-bytes-2", "twice the same body", "text/plain");
  await putObject("nested/deep/key with spaces.bin", randomBytes(70_000), "application/octet-stream");
  closeDb = (await import("~/db/client.server")).closeDb;
}, 120_000);

afterAll(async () => {
  await closeDb?.();
  await s3?.close();
  rmSync(root, { recursive: true, force: true });
});

/** Runs a CLI without blocking this process (the S3 fake it talks to lives here). */
function cli(script: string, args: string[], env: NodeJS.ProcessEnv): Promise<{ status: number | null; stdout: string; stderr: string }> {
  const child = spawn(process.execPath, ["node_modules/tsx/dist/cli.mjs", script, ...args], { env: { ...process.env, ...env }, stdio: ["ignore", "pipe", "pipe"] });
  let stdout = "";
  let stderr = "";
  child.stdout.on("data", (c: Buffer) => (stdout += c.toString()));
  child.stderr.on("data", (c: Buffer) => (stderr += c.toString()));
  const timer = setTimeout(() => child.kill("SIGKILL"), 120_000);
  return new Promise((resolve) =>
    child.on("exit", (status) => {
      clearTimeout(timer);
      resolve({ status, stdout, stderr });
    }),
  );
}

async function objectHashes(bucket: string): Promise<Record<string, string>> {
  const client = storageClient({ S3_ENDPOINT: `http://127.0.0.1:${s3Port}`, S3_REGION: "us-east-1", S3_ACCESS_KEY_ID: process.env.S3_ACCESS_KEY_ID ?? "S3RVER", S3_SECRET_ACCESS_KEY: process.env.S3_SECRET_ACCESS_KEY ?? "S3RVER" });
  const out: Record<string, string> = {};
  const list = await client.send(new ListObjectsV2Command({ Bucket: bucket }));
  for (const o of list.Contents ?? []) {
    const got = await client.send(new GetObjectCommand({ Bucket: bucket, Key: o.Key! }));
    out[o.Key!] = sha256(await got.Body!.transformToByteArray());
  }
  return out;
}

describe("backup and restore", () => {
  it("round-trips every table's rows and every object's bytes into an empty database and bucket", async () => {
    const out = join(root, "backup-1");
    const backup = await cli("scripts/backup.ts", ["--out", out], { DATABASE_URL: sourceUrl, S3_ENDPOINT: `http://127.0.0.1:${s3Port}`, S3_BUCKET: "gc-source" });
    expect(backup.status, backup.stderr).toBe(0);
    const manifest = JSON.parse(readFileSync(join(out, "manifest.json"), "utf8")) as BackupManifest;
    expect(existsSync(join(out, manifest.database.file))).toBe(true);

    const src = postgres(sourceUrl, { max: 1, onnotice: () => {} });
    const sourceCounts = await rowCounts(src);
    await src.end();
    expect(manifest.database.tables).toEqual(sourceCounts);
    expect(sourceCounts["public.upload_files"] ?? sourceCounts[Object.keys(sourceCounts).find((k) => k.endsWith(".upload_files"))!]).toBe(2);
    const sourceObjects = await objectHashes("gc-source");
    expect(Object.keys(sourceObjects)).toHaveLength(5);
    expect(Object.fromEntries(manifest.objects.map((o) => [o.key, o.sha256]))).toEqual(sourceObjects);

    // Into an empty database (no migrations) and a bucket that does not exist yet.
    const cluster = clusterFor(process.env.TEST_PG_DATA!, Number(process.env.TEST_PG_PORT));
    const targetName = `gatecrash_restored_${process.pid}`;
    createDatabase(cluster, targetName);
    const targetUrl = cluster.url(targetName);
    const restore = await cli("scripts/restore.ts", [out], { DATABASE_URL: targetUrl, S3_ENDPOINT: `http://127.0.0.1:${s3Port}`, S3_BUCKET: "gc-restored" });
    expect(restore.status, restore.stderr + restore.stdout).toBe(0);

    const tgt = postgres(targetUrl, { max: 1, onnotice: () => {} });
    expect(await rowCounts(tgt)).toEqual(sourceCounts);
    await tgt.end();
    expect(await objectHashes("gc-restored")).toEqual(sourceObjects);

    // A second restore into the now filled database is refused, leaving it as it is.
    const again = await cli("scripts/restore.ts", [out], { DATABASE_URL: targetUrl, S3_ENDPOINT: `http://127.0.0.1:${s3Port}`, S3_BUCKET: "gc-other" });
    expect(again.status).toBe(3);
    expect(again.stderr).toMatch(/empty database/);
  }, 240_000);
});
