// The maintained fork of s3rver ships no type declarations; these cover what the S3 stand-in uses.
declare module "@20minutes/s3rver" {
  import type { AddressInfo } from "node:net";

  export type S3rverOptions = {
    address?: string;
    port?: number;
    directory?: string;
    silent?: boolean;
    allowMismatchedSignatures?: boolean;
    configureBuckets?: { name: string; configs: (string | Buffer)[] }[];
  };

  export default class S3rver {
    constructor(options: S3rverOptions);
    run(): Promise<AddressInfo>;
    close(): Promise<void>;
  }
}
