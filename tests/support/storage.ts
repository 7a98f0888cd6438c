// The objects the S3 fake holds under a prefix (every page of the listing), for tests that check
// nothing is left behind.
import { ListObjectsV2Command, S3Client } from "@aws-sdk/client-s3";
import { env } from "../../app/lib/env.server";

let client: S3Client | undefined;
function s3(): S3Client {
  const e = env();
  return (client ??= new S3Client({
    endpoint: e.S3_ENDPOINT,
    region: e.S3_REGION,
    forcePathStyle: true,
    credentials: { accessKeyId: e.S3_ACCESS_KEY_ID, secretAccessKey: e.S3_SECRET_ACCESS_KEY },
  }));
}

export async function objectKeys(prefix: string): Promise<string[]> {
  const keys: string[] = [];
  let token: string | undefined;
  do {
    const res = await s3().send(new ListObjectsV2Command({ Bucket: env().S3_BUCKET, Prefix: prefix, ContinuationToken: token }));
    for (const o of res.Contents ?? []) if (o.Key) keys.push(o.Key);
    token = res.IsTruncated ? res.NextContinuationToken : undefined;
  } while (token);
  return keys;
}
