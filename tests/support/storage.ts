// The objects the S3 fake holds under a prefix (every page of the listing), for tests that check
// nothing is left behind.
import { ListObjectsV2Command } from "@aws-sdk/client-s3";
import { env } from "../../app/lib/env.server";
import { s3 } from "../../app/lib/storage.server";

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
