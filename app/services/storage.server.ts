import type { Readable } from "node:stream";
import {
  CreateBucketCommand,
  DeleteObjectCommand,
  GetObjectCommand,
  HeadBucketCommand,
  ListObjectsV2Command,
  PutObjectCommand,
  S3Client,
} from "@aws-sdk/client-s3";
import { type Env, env } from "~/utils/env.server";

export type Storage = ReturnType<typeof createStorage>;

export function createStorage(
  settings: Pick<Env, "S3_ENDPOINT" | "S3_REGION" | "S3_BUCKET" | "S3_ACCESS_KEY_ID" | "S3_SECRET_ACCESS_KEY" | "S3_PUBLIC_URL">,
) {
  // The pinned SDK runs on Node 20; its notice about later releases needing Node 22 is noise in every log.
  process.env.AWS_SDK_JS_NODE_VERSION_SUPPORT_WARNING_DISABLED ??= "true";
  const client = new S3Client({
    endpoint: settings.S3_ENDPOINT,
    region: settings.S3_REGION,
    credentials: { accessKeyId: settings.S3_ACCESS_KEY_ID, secretAccessKey: settings.S3_SECRET_ACCESS_KEY },
    forcePathStyle: true,
    // Without these the SDK streams aws-chunked bodies that simpler S3 servers store verbatim.
    requestChecksumCalculation: "WHEN_REQUIRED",
    responseChecksumValidation: "WHEN_REQUIRED",
  });
  const bucket = settings.S3_BUCKET;

  return {
    bucket,
    async ensureBucket() {
      try {
        await client.send(new HeadBucketCommand({ Bucket: bucket }));
      } catch {
        await client.send(new CreateBucketCommand({ Bucket: bucket }));
      }
    },
    async put(key: string, body: Buffer, contentType: string) {
      await client.send(
        new PutObjectCommand({
          Bucket: bucket,
          Key: key,
          Body: body,
          ContentType: contentType,
          CacheControl: "public, max-age=31536000, immutable",
        }),
      );
    },
    async get(key: string) {
      const out = await client.send(new GetObjectCommand({ Bucket: bucket, Key: key }));
      return { body: out.Body as Readable, contentType: out.ContentType, contentLength: out.ContentLength };
    },
    /** Removes objects by key; a key already gone is no error (S3 DeleteObject answers 204 either way). */
    async delete(keys: string[]) {
      for (const key of keys) await client.send(new DeleteObjectCommand({ Bucket: bucket, Key: key }));
    },
    /** Every key under a prefix, page by page (ListObjectsV2 returns at most 1,000 per call). */
    async list(prefix: string): Promise<string[]> {
      const keys: string[] = [];
      let token: string | undefined;
      do {
        const out = await client.send(new ListObjectsV2Command({ Bucket: bucket, Prefix: prefix, ContinuationToken: token }));
        for (const item of out.Contents ?? []) if (item.Key) keys.push(item.Key);
        token = out.IsTruncated ? out.NextContinuationToken : undefined;
      } while (token);
      return keys;
    },
    /** Public address of a stored object: the CDN/bucket URL when configured, else the app's media route. */
    publicUrl(key: string) {
      return settings.S3_PUBLIC_URL ? `${settings.S3_PUBLIC_URL.replace(/\/$/, "")}/${key}` : `/media/${key}`;
    },
  };
}

let instance: Storage | undefined;

/** The process-wide store, from the environment. */
export function getStorage(): Storage {
  instance ??= createStorage(env());
  return instance;
}
