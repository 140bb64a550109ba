// s3rver 3.7.1 ships no types; this covers the part fakes/s3.ts uses.
declare module "s3rver" {
  import type { IncomingMessage, ServerResponse } from "node:http";
  interface S3rverOptions {
    address?: string;
    port?: number;
    directory?: string;
    silent?: boolean;
    resetOnClose?: boolean;
    allowMismatchedSignatures?: boolean;
    vhostBuckets?: boolean;
    configureBuckets?: Array<{ name: string; configs?: Array<string | Buffer> }>;
  }
  export default class S3rver {
    constructor(options?: S3rverOptions);
    configureBuckets(): Promise<void>;
    callback(): (req: IncomingMessage, res: ServerResponse) => void;
    reset(): void;
  }
}
