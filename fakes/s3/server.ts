import S3rver from "s3rver";
import { mkdirSync } from "node:fs";
import { createRequire } from "node:module";

/**
 * The local stand-in for S3 (s3rver, a registry package). The bucket gets a CORS rule so that browsers can PUT
 * presigned multipart parts straight to it and read the ETag of each part (STACK.md).
 */
const CORS = `<CORSConfiguration>
  <CORSRule>
    <AllowedOrigin>*</AllowedOrigin>
    <AllowedMethod>GET</AllowedMethod>
    <AllowedMethod>PUT</AllowedMethod>
    <AllowedMethod>POST</AllowedMethod>
    <AllowedMethod>HEAD</AllowedMethod>
    <AllowedHeader>*</AllowedHeader>
    <ExposeHeader>ETag</ExposeHeader>
    <MaxAgeSeconds>3000</MaxAgeSeconds>
  </CORSRule>
</CORSConfiguration>`;

export interface S3FakeOptions {
  port: number;
  directory: string;
  bucket: string;
  /** Access keys to accept instead of s3rver's built-in S3RVER/S3RVER pair (a stack's own secrets). */
  keys?: { accessKeyId: string; secretAccessKey: string };
}

/** s3rver keeps its key pairs in one registry on its dummy account; a stack with its own keys swaps them in. */
function useKeys(keys: NonNullable<S3FakeOptions["keys"]>): void {
  const { DUMMY_ACCOUNT } = createRequire(import.meta.url)("s3rver/lib/models/account") as {
    DUMMY_ACCOUNT: { createKeyPair(id: string, secret: string): void; revokeAccessKey(id: string): void };
  };
  DUMMY_ACCOUNT.createKeyPair(keys.accessKeyId, keys.secretAccessKey);
  if (keys.accessKeyId !== "S3RVER") DUMMY_ACCOUNT.revokeAccessKey("S3RVER");
}

export async function startS3Fake(opts: S3FakeOptions): Promise<{ close(): Promise<void> }> {
  mkdirSync(opts.directory, { recursive: true });
  if (opts.keys) useKeys(opts.keys);
  const server = new S3rver({
    port: opts.port,
    address: "127.0.0.1",
    directory: opts.directory,
    silent: true,
    configureBuckets: [{ name: opts.bucket, configs: [CORS] }],
  });
  await server.run();
  return { close: () => server.close() };
}

const isMain = process.argv[1] && import.meta.url.endsWith(process.argv[1].replace(/^.*\/fakes\//, "/fakes/"));
if (isMain) {
  const port = Number(process.env.S3_FAKE_PORT ?? 4569);
  const directory = process.env.S3_FAKE_DIR ?? ".gatecrash/s3";
  const bucket = process.env.S3_BUCKET ?? "gatecrash";
  const keys = process.env.S3_ACCESS_KEY_ID && process.env.S3_SECRET_ACCESS_KEY ? { accessKeyId: process.env.S3_ACCESS_KEY_ID, secretAccessKey: process.env.S3_SECRET_ACCESS_KEY } : undefined;
  await startS3Fake({ port, directory, bucket, keys });
  console.log(`S3 fake on http://127.0.0.1:${port} (bucket ${bucket}, data in ${directory})`);
}
