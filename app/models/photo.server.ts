// Photo uploads and report photos. Invariant: every object written to the bucket is listed
// first, in `uploads` (pending) or `report_photos` (attached), so nothing can be orphaned: the
// worker's cleanupExpiredUploads() removes whatever was never attached.
import { randomUUID } from "node:crypto";
import type { Knex } from "knex";
import { db as defaultDb, type Db } from "~/db.server";
import { exifTimeToIso, PhotoRejectedError, processPhoto, type ProcessedPhoto } from "~/services/photo-processing.server";
import { deleteObjects, getObject, headObject, presignPut, putObject, StorageUnavailableError } from "~/services/storage.server";

/** Pending uploads live this long before cleanup (enough to finish filling in the form). */
export const UPLOAD_TTL_MS = 6 * 60 * 60_000;
/** A presigned PUT URL is valid this long. */
export const PRESIGN_TTL_S = 15 * 60;

export type StoredUpload = {
  id: string;
  contentType: string;
  bytes: number;
  width: number;
  height: number;
  exif: { lat: number | null; lon: number | null; takenAtRaw: string | null };
};

const keysFor = (id: string, format: string) => ({
  original_key: `originals/${id}.${format === "jpeg" ? "jpg" : format}`,
  public_key: `public/${id}.jpg`,
  thumb_key: `thumbs/${id}.jpg`,
});

/**
 * Stores a processed photo: the pending row is written first, then the three objects. If
 * storage fails half-way the row is expired at once and the objects already written removed
 * (now if storage answers, else by the cleanup), and StorageUnavailableError is rethrown.
 */
export async function storeProcessedPhoto(p: ProcessedPhoto, ownerUserId: number | null, db: Db = defaultDb, existingId?: string): Promise<StoredUpload> {
  const id = existingId ?? randomUUID();
  const keys = keysFor(id, p.format);
  const fields = {
    state: "stored" as const,
    ...keys,
    content_type: p.contentType,
    bytes: p.bytes,
    width: p.width,
    height: p.height,
    exif_lat: p.exif.lat,
    exif_lon: p.exif.lon,
    exif_taken_at: p.exif.takenAtRaw,
  };
  // Written before the objects so a crash between the two never leaves an unlisted object.
  if (existingId) await db("uploads").where({ id }).update({ ...fields, expires_at: new Date(Date.now() + UPLOAD_TTL_MS) });
  else await db("uploads").insert({ id, ...fields, owner_user_id: ownerUserId, expires_at: new Date(Date.now() + UPLOAD_TTL_MS) });
  try {
    await putObject(keys.original_key, p.original, p.contentType);
    await putObject(keys.public_key, p.publicJpeg, "image/jpeg");
    await putObject(keys.thumb_key, p.thumbJpeg, "image/jpeg");
  } catch (e) {
    await db("uploads").where({ id }).update({ expires_at: new Date(0) });
    await deleteObjects(Object.values(keys)).catch(() => undefined); // the cleanup retries later
    throw e instanceof StorageUnavailableError ? e : new StorageUnavailableError(e);
  }
  return { id, contentType: p.contentType, bytes: p.bytes, width: p.width, height: p.height, exif: { lat: p.exif.lat, lon: p.exif.lon, takenAtRaw: p.exif.takenAtRaw } };
}

/** A presigned PUT for API clients; the bytes are checked when the report (or /complete) uses them. */
export async function createPresignedUpload(contentType: string, ownerUserId: number | null, db: Db = defaultDb) {
  const id = randomUUID();
  const incoming = `incoming/${id}`;
  await db("uploads").insert({ id, state: "awaiting_put", incoming_key: incoming, content_type: contentType, owner_user_id: ownerUserId, expires_at: new Date(Date.now() + UPLOAD_TTL_MS) });
  const url = await presignPut(incoming, contentType, PRESIGN_TTL_S);
  return { id, url, method: "PUT" as const, headers: { "Content-Type": contentType }, expiresInS: PRESIGN_TTL_S };
}

export class UploadProblem extends Error {
  constructor(
    message: string,
    readonly uploadId: string,
    readonly status = 400,
  ) {
    super(message);
  }
}

/**
 * Turns a presigned upload into a stored photo: reads the bytes the client PUT, checks and
 * processes them like a browser upload, then removes the raw object.
 */
export async function completePresignedUpload(id: string, timeZone: string, db: Db = defaultDb): Promise<StoredUpload> {
  const row = await db("uploads").where({ id }).first();
  if (!row || new Date(row.expires_at).getTime() < Date.now()) throw new UploadProblem(`Upload ${id} is unknown or has expired: request a new one`, id, 404);
  if (row.state === "stored") return uploadOf(row);
  const obj = await getObject(row.incoming_key);
  if (!obj) throw new UploadProblem(`Upload ${id} has not been received: PUT the photo to its URL first`, id, 409);
  let processed: ProcessedPhoto;
  try {
    processed = await processPhoto(obj.body, { name: `upload ${id.slice(0, 8)}`, timeZone });
  } catch (e) {
    if (e instanceof PhotoRejectedError) {
      await db("uploads").where({ id }).update({ expires_at: new Date(0) });
      throw new UploadProblem(e.message, id, 422);
    }
    throw e;
  }
  const stored = await storeProcessedPhoto(processed, row.owner_user_id, db, id);
  await deleteObjects([row.incoming_key]).catch(() => undefined);
  await db("uploads").where({ id }).update({ incoming_key: null });
  return stored;
}

function uploadOf(r: Record<string, unknown>): StoredUpload {
  return {
    id: r.id as string,
    contentType: r.content_type as string,
    bytes: Number(r.bytes),
    width: Number(r.width),
    height: Number(r.height),
    exif: { lat: (r.exif_lat as number | null) ?? null, lon: (r.exif_lon as number | null) ?? null, takenAtRaw: (r.exif_taken_at as string | null) ?? null },
  };
}

export async function getUploads(ids: string[], db: Db = defaultDb): Promise<(Record<string, unknown> & { id: string })[]> {
  if (ids.length === 0) return [];
  return db("uploads").whereIn("id", ids);
}

/**
 * Checks, before a report is written, that each upload exists, is usable by this reporter, and
 * that its objects really are in storage (a report never points at an object that is not
 * stored). Throws UploadProblem or StorageUnavailableError.
 */
export async function verifyUploadsStored(ids: string[], ownerUserId: number | null, db: Db = defaultDb): Promise<StoredUpload[]> {
  const rows = await getUploads(ids, db);
  const byId = new Map(rows.map((r) => [r.id, r]));
  const out: StoredUpload[] = [];
  for (const id of ids) {
    const r = byId.get(id);
    if (!r || new Date(r.expires_at as Date).getTime() < Date.now()) throw new UploadProblem(`Photo upload ${id} is unknown or has expired: add the photo again`, id);
    if (r.owner_user_id !== null && r.owner_user_id !== ownerUserId) throw new UploadProblem(`Photo upload ${id} is unknown or has expired: add the photo again`, id);
    if (r.state !== "stored") throw new UploadProblem(`Photo upload ${id} has not been completed: PUT the photo, then POST /api/v1/uploads/${id}/complete`, id, 409);
    for (const key of [r.original_key, r.public_key, r.thumb_key] as string[]) {
      if (!(await headObject(key))) throw new UploadProblem(`Photo upload ${id} is missing from storage: add the photo again`, id);
    }
    out.push(uploadOf(r));
  }
  if (new Set(ids).size !== ids.length) throw new UploadProblem("The same photo is attached twice", ids[0]!);
  return out;
}

/** Moves verified uploads onto a report inside the report's transaction (locks the rows). */
export async function attachUploads(reportId: number, ids: string[], trx: Knex.Transaction): Promise<void> {
  if (ids.length === 0) return;
  const rows = await trx("uploads").whereIn("id", ids).forUpdate();
  if (rows.length !== ids.length) throw new UploadProblem("A photo upload expired while the report was being sent: add it again", ids[0]!);
  const byId = new Map(rows.map((r: { id: string }) => [r.id, r]));
  await trx("report_photos").insert(
    ids.map((id, i) => {
      const r = byId.get(id) as Record<string, unknown>;
      return {
        id,
        report_id: reportId,
        position: i + 1,
        original_key: r.original_key,
        public_key: r.public_key,
        thumb_key: r.thumb_key,
        content_type: r.content_type,
        bytes: r.bytes,
        width: r.width,
        height: r.height,
        exif_lat: r.exif_lat,
        exif_lon: r.exif_lon,
        exif_taken_at: r.exif_taken_at,
      };
    }),
  );
  await trx("uploads").whereIn("id", ids).delete();
}

export type ReportPhoto = { id: string; position: number; width: number; height: number; exifLat: number | null; exifLon: number | null; exifTakenAt: string | null };

export async function photosOfReports(reportIds: number[], db: Db = defaultDb): Promise<Map<number, ReportPhoto[]>> {
  const out = new Map<number, ReportPhoto[]>();
  if (reportIds.length === 0) return out;
  const rows = await db("report_photos").whereIn("report_id", reportIds).orderBy(["report_id", "position"]);
  for (const r of rows) {
    const list = out.get(r.report_id) ?? [];
    list.push({ id: r.id, position: r.position, width: r.width, height: r.height, exifLat: r.exif_lat, exifLon: r.exif_lon, exifTakenAt: r.exif_taken_at });
    out.set(r.report_id, list);
  }
  return out;
}

/** The key of the public copy or thumbnail of an attached photo or a pending upload; never the original. */
export async function servableKey(id: string, size: "public" | "thumb", db: Db = defaultDb): Promise<string | null> {
  const col = size === "public" ? "public_key" : "thumb_key";
  const attached = await db("report_photos").select(col).where({ id }).first();
  if (attached) return attached[col];
  const pending = await db("uploads").select(col, "expires_at", "state").where({ id }).first();
  if (pending && pending.state === "stored" && new Date(pending.expires_at).getTime() > Date.now()) return pending[col];
  return null;
}

/**
 * Removes uploads never attached to a report once they have expired: objects first, then the
 * row (so a storage outage leaves the row for the next run). Returns how many were removed.
 */
export async function cleanupExpiredUploads(opts: { now?: Date; limit?: number } = {}, db = defaultDb): Promise<{ removed: number; failed: number }> {
  const now = opts.now ?? new Date();
  let removed = 0;
  let failed = 0;
  await db.transaction(async (trx) => {
    const rows = await trx("uploads")
      .where("expires_at", "<", now)
      .orderBy("expires_at")
      .limit(opts.limit ?? 100)
      .forUpdate()
      .skipLocked();
    for (const r of rows) {
      try {
        await deleteObjects([r.incoming_key, r.original_key, r.public_key, r.thumb_key].filter(Boolean));
        await trx("uploads").where({ id: r.id }).delete();
        removed++;
      } catch {
        failed++;
      }
    }
  });
  return { removed, failed };
}

/** The JSON answer for an upload (browser and API alike): sizes, EXIF hints, where to see it. */
export function uploadBody(u: StoredUpload, zone: string) {
  const m = /^(.{19})([+-]\d{2}:\d{2})?$/.exec(u.exif.takenAtRaw ?? "");
  return {
    id: u.id,
    contentType: u.contentType,
    bytes: u.bytes,
    width: u.width,
    height: u.height,
    exif: { lat: u.exif.lat, lon: u.exif.lon, takenAt: m ? exifTimeToIso(m[1]!, m[2] ?? null, zone) : null },
    thumbUrl: `/photos/${u.id}/thumb`,
    publicUrl: `/photos/${u.id}/public`,
  };
}
