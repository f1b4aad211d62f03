import { HeadBucketCommand } from "@aws-sdk/client-s3";
import { env } from "~/env.server";
import { s3 } from "~/storage/s3.server";

/** Does the object store answer right now? A HeadBucket bounded in time, used after a request failed. */
export async function storageAnswers(timeoutMs = 2000): Promise<boolean> {
  const abortSignal = AbortSignal.timeout(timeoutMs);
  return s3()
    .send(new HeadBucketCommand({ Bucket: env().S3_BUCKET }), { abortSignal })
    .then(
      () => true,
      () => false,
    );
}

export const STORAGE_AWAY_MESSAGE = "File storage is not answering right now. Parts already sent are kept: resume the upload in a moment.";
