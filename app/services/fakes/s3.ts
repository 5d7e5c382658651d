import { mkdirSync } from "node:fs";
import type { AddressInfo } from "node:net";
import S3rver from "s3rver";

/** An S3-compatible store on 127.0.0.1, files kept under `directory`. */
export async function startS3Fake(options: { port: number; directory: string; bucket: string }) {
  mkdirSync(options.directory, { recursive: true });
  const server = new S3rver({
    address: "127.0.0.1",
    port: options.port,
    directory: options.directory,
    silent: true,
    configureBuckets: [{ name: options.bucket, configs: [] }],
  });
  const address = (await server.run()) as AddressInfo;
  return {
    url: `http://127.0.0.1:${address.port}`,
    stop: () => server.close(),
  };
}
