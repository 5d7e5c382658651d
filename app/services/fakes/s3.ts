import { mkdirSync } from "node:fs";
import S3rver from "@20minutes/s3rver";

/** An S3-compatible store on 127.0.0.1, files kept under `directory`. */
export async function startS3Fake(options: { port: number; directory: string; bucket: string }) {
  mkdirSync(options.directory, { recursive: true });
  const server = new S3rver({
    address: "127.0.0.1",
    port: options.port,
    directory: options.directory,
    silent: true,
    // The AWS SDK signs bucket requests as "/bucket/" and this server checks them as "/bucket", so
    // every HeadBucket would fail. The key id is still checked; real S3 checks the signature.
    allowMismatchedSignatures: true,
    configureBuckets: [{ name: options.bucket, configs: [] }],
  });
  const address = await server.run();
  return {
    url: `http://127.0.0.1:${address.port}`,
    stop: () => server.close(),
  };
}
