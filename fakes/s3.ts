// Local S3-compatible server (s3rver) on 127.0.0.1, storing objects as files in `dir`.
// The app talks to it through @aws-sdk/client-s3 exactly as to a hosted bucket.
import { mkdirSync } from "node:fs";
import { createServer } from "node:http";
import type { AddressInfo } from "node:net";
import S3rver from "s3rver";

// Browsers may PUT to presigned URLs from app pages; a hosted bucket would carry a CORS rule
// for that, so the fake does too.
const CORS = `<CORSConfiguration>
  <CORSRule>
    <AllowedOrigin>*</AllowedOrigin>
    <AllowedMethod>GET</AllowedMethod><AllowedMethod>HEAD</AllowedMethod>
    <AllowedMethod>PUT</AllowedMethod><AllowedMethod>POST</AllowedMethod>
    <AllowedHeader>*</AllowedHeader>
    <ExposeHeader>ETag</ExposeHeader>
    <MaxAgeSeconds>3000</MaxAgeSeconds>
  </CORSRule>
</CORSConfiguration>`;

export interface S3Fake {
  port: number;
  endpoint: string;
  stop(): Promise<void>;
}

/** Starts the fake with `bucket` created. `port: 0` picks a free port (see the returned port). */
export async function startS3Fake(o: { port: number; dir: string; bucket: string }): Promise<S3Fake> {
  mkdirSync(o.dir, { recursive: true });
  const s3 = new S3rver({
    directory: o.dir,
    silent: true,
    // Path-style only (the app sets forcePathStyle), so host names never matter.
    vhostBuckets: false,
    configureBuckets: [{ name: o.bucket, configs: [CORS] }],
  });
  await s3.configureBuckets();
  // Our own listener instead of s3rver.run(): run() turns EADDRINUSE into an uncaught error.
  const server = createServer(s3.callback());
  await new Promise<void>((resolve, reject) => {
    server.once("error", reject);
    server.listen(o.port, "127.0.0.1", () => {
      server.off("error", reject);
      resolve();
    });
  });
  const port = (server.address() as AddressInfo).port;
  return {
    port,
    endpoint: `http://127.0.0.1:${port}`,
    stop: () =>
      new Promise<void>((resolve) => {
        server.close(() => resolve());
        server.closeAllConnections();
      }),
  };
}
