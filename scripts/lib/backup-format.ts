import { createHash } from "node:crypto";
import { S3Client } from "@aws-sdk/client-s3";
import postgres from "postgres";

/**
 * Gatecrash's backup folder: `database.dump` (pg_dump custom format), `objects/<sha256>` (one file per distinct
 * object body) and `manifest.json` describing both, with each table's row count taken in the dump's own snapshot.
 */
export interface BackupManifest {
  format: "gatecrash-backup/1";
  createdAt: string;
  database: { file: string; tables: Record<string, number> };
  bucket: string;
  objects: { key: string; sha256: string; size: number; contentType: string | null; file: string }[];
}

export const sha256 = (b: Uint8Array): string => createHash("sha256").update(b).digest("hex");

export function storageClient(e: { S3_ENDPOINT: string; S3_REGION: string; S3_ACCESS_KEY_ID: string; S3_SECRET_ACCESS_KEY: string }): S3Client {
  return new S3Client({
    endpoint: e.S3_ENDPOINT,
    region: e.S3_REGION,
    forcePathStyle: true,
    credentials: { accessKeyId: e.S3_ACCESS_KEY_ID, secretAccessKey: e.S3_SECRET_ACCESS_KEY },
    requestChecksumCalculation: "WHEN_REQUIRED",
    responseChecksumValidation: "WHEN_REQUIRED",
  });
}

/** Every ordinary table outside the system schemas, as "schema.table". */
export async function tableNames(sql: postgres.Sql | postgres.TransactionSql): Promise<string[]> {
  const rows = await sql<{ name: string }[]>`
    select table_schema || '.' || table_name as name from information_schema.tables
    where table_type = 'BASE TABLE' and table_schema not in ('pg_catalog', 'information_schema')
    order by 1`;
  return rows.map((r) => r.name);
}

export async function rowCounts(sql: postgres.Sql | postgres.TransactionSql): Promise<Record<string, number>> {
  const out: Record<string, number> = {};
  for (const name of await tableNames(sql)) {
    const [schema, table] = name.split(".");
    const [r] = await sql<{ n: string }[]>`select count(*)::text as n from ${sql(schema)}.${sql(table)}`;
    out[name] = Number(r.n);
  }
  return out;
}
