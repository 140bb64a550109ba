// Object storage (S3 API). Photos' originals stay private; only the app reads them back.
// STACK.md: with s3rver (and some hosted S3 look-alikes) the client needs forcePathStyle and
// both checksum settings "WHEN_REQUIRED", or streamed uploads are stored with chunk framing.
import {
  DeleteObjectsCommand,
  GetObjectCommand,
  HeadObjectCommand,
  PutObjectCommand,
  S3Client,
  DeleteObjectCommand,
} from "@aws-sdk/client-s3";
import { getSignedUrl } from "@aws-sdk/s3-request-presigner";
import { env } from "~/env.server";

export interface StorageConfig {
  endpoint?: string;
  region: string;
  bucket: string;
  accessKeyId: string;
  secretAccessKey: string;
  forcePathStyle: boolean;
}

/** Thrown when object storage cannot be reached or refuses a request: shown as a 503. */
export class StorageUnavailableError extends Error {
  constructor(cause: unknown) {
    super(`Object storage is unavailable: ${(cause as Error)?.message ?? cause}`);
    this.name = "StorageUnavailableError";
  }
}

export const STORAGE_UNAVAILABLE_MESSAGE =
  "Photo storage cannot be reached just now, so your report has not been sent. Nothing was saved and your text is kept: try again in a minute, or send it without photos.";

let override: Partial<StorageConfig> | null = null;
let client: S3Client | null = null;
let clientKey = "";

function config(): StorageConfig {
  const e = env();
  return {
    endpoint: e.S3_ENDPOINT,
    region: e.S3_REGION,
    bucket: e.S3_BUCKET,
    accessKeyId: e.S3_ACCESS_KEY_ID,
    secretAccessKey: e.S3_SECRET_ACCESS_KEY,
    forcePathStyle: e.S3_FORCE_PATH_STYLE,
    ...override,
  };
}

/** Tests point storage at their own fake (which they stop and restart). */
export function configureStorageForTests(c: Partial<StorageConfig> | null) {
  override = c;
  client?.destroy();
  client = null;
}

function s3(): { client: S3Client; bucket: string } {
  const c = config();
  const key = JSON.stringify(c);
  if (!client || key !== clientKey) {
    client?.destroy();
    client = new S3Client({
      endpoint: c.endpoint,
      region: c.region,
      forcePathStyle: c.forcePathStyle,
      credentials: { accessKeyId: c.accessKeyId, secretAccessKey: c.secretAccessKey },
      requestChecksumCalculation: "WHEN_REQUIRED",
      responseChecksumValidation: "WHEN_REQUIRED",
      // Fail fast when storage is down: a form submit must not hang for minutes.
      maxAttempts: 2,
      requestHandler: { connectionTimeout: 2000, requestTimeout: 15_000 },
    });
    clientKey = key;
  }
  return { client, bucket: c.bucket };
}

function isNotFound(e: unknown): boolean {
  const err = e as { name?: string; $metadata?: { httpStatusCode?: number } };
  return err?.name === "NoSuchKey" || err?.name === "NotFound" || err?.$metadata?.httpStatusCode === 404;
}

async function guard<T>(fn: () => Promise<T>): Promise<T> {
  try {
    return await fn();
  } catch (e) {
    if (isNotFound(e)) throw e;
    throw new StorageUnavailableError(e);
  }
}

export async function putObject(key: string, body: Buffer, contentType: string): Promise<void> {
  const { client, bucket } = s3();
  await guard(() => client.send(new PutObjectCommand({ Bucket: bucket, Key: key, Body: body, ContentType: contentType, ContentLength: body.length })));
}

/** The object's bytes, or null when there is no such object. */
export async function getObject(key: string): Promise<{ body: Buffer; contentType?: string } | null> {
  const { client, bucket } = s3();
  try {
    const res = await guard(() => client.send(new GetObjectCommand({ Bucket: bucket, Key: key })));
    const bytes = await res.Body!.transformToByteArray();
    return { body: Buffer.from(bytes), contentType: res.ContentType };
  } catch (e) {
    if (isNotFound(e)) return null;
    throw e;
  }
}

/** Size of a stored object, or null when it is not there. */
export async function headObject(key: string): Promise<{ bytes: number } | null> {
  const { client, bucket } = s3();
  try {
    const res = await guard(() => client.send(new HeadObjectCommand({ Bucket: bucket, Key: key })));
    return { bytes: res.ContentLength ?? 0 };
  } catch (e) {
    if (isNotFound(e)) return null;
    throw e;
  }
}

export async function deleteObjects(keys: string[]): Promise<void> {
  const list = keys.filter(Boolean);
  if (list.length === 0) return;
  const { client, bucket } = s3();
  if (list.length === 1) {
    await guard(() => client.send(new DeleteObjectCommand({ Bucket: bucket, Key: list[0] })));
    return;
  }
  await guard(() => client.send(new DeleteObjectsCommand({ Bucket: bucket, Delete: { Objects: list.map((Key) => ({ Key })), Quiet: true } })));
}

/** A presigned PUT for a client outside the browser (the API), valid for `expiresS`. */
export async function presignPut(key: string, contentType: string, expiresS = 900): Promise<string> {
  const { client, bucket } = s3();
  return getSignedUrl(client, new PutObjectCommand({ Bucket: bucket, Key: key, ContentType: contentType }), { expiresIn: expiresS });
}

export async function presignGet(key: string, expiresS = 300): Promise<string> {
  const { client, bucket } = s3();
  return getSignedUrl(client, new GetObjectCommand({ Bucket: bucket, Key: key }), { expiresIn: expiresS });
}

/** Every key under a prefix (tests and cleanup checks). */
export async function listKeys(prefix = ""): Promise<string[]> {
  const { ListObjectsV2Command } = await import("@aws-sdk/client-s3");
  const { client, bucket } = s3();
  const keys: string[] = [];
  let token: string | undefined;
  do {
    const res = await guard(() => client.send(new ListObjectsV2Command({ Bucket: bucket, Prefix: prefix, ContinuationToken: token })));
    for (const o of res.Contents ?? []) if (o.Key) keys.push(o.Key);
    token = res.IsTruncated ? res.NextContinuationToken : undefined;
  } while (token);
  return keys;
}
