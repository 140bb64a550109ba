// Photo checks and processing: content (not name) decides what a file is; the published copies
// are re-encoded by sharp without any metadata (a boater's photo GPS can reveal where they live).
import exifr from "exifr";
import { DateTime } from "luxon";
import sharp, { type Metadata } from "sharp";

export const MAX_PHOTO_BYTES = 20 * 1024 * 1024;
export const MAX_PHOTOS_PER_REPORT = 6;
/** 64 megapixels: above any phone camera's output, far below a decompression bomb. */
export const MAX_PHOTO_PIXELS = 64_000_000;
export const PUBLIC_MAX_PX = 1600;
export const THUMB_MAX_PX = 320;

export type PhotoFormat = "jpeg" | "png" | "webp";
export const PHOTO_CONTENT_TYPES: Record<PhotoFormat, string> = { jpeg: "image/jpeg", png: "image/png", webp: "image/webp" };

export interface ProcessedPhoto {
  format: PhotoFormat;
  contentType: string;
  bytes: number;
  width: number;
  height: number;
  original: Buffer;
  publicJpeg: Buffer;
  thumbJpeg: Buffer;
  exif: { lat: number | null; lon: number | null; takenAtRaw: string | null; takenAt: string | null };
}

export class PhotoRejectedError extends Error {
  constructor(message: string) {
    super(message);
    this.name = "PhotoRejectedError";
  }
}

/** The format from the file's first bytes (magic numbers), or a description of what it is. */
export function sniffFormat(buf: Buffer): PhotoFormat | { other: string } {
  if (buf.length >= 3 && buf[0] === 0xff && buf[1] === 0xd8 && buf[2] === 0xff) return "jpeg";
  if (buf.length >= 8 && buf.subarray(0, 8).equals(Buffer.from([0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a]))) return "png";
  if (buf.length >= 12 && buf.toString("latin1", 0, 4) === "RIFF" && buf.toString("latin1", 8, 12) === "WEBP") return "webp";
  if (buf.length >= 2 && buf[0] === 0x4d && buf[1] === 0x5a) return { other: "a Windows program" };
  if (buf.length >= 4 && buf[0] === 0x7f && buf.toString("latin1", 1, 4) === "ELF") return { other: "a program" };
  if (buf.length >= 2 && buf.toString("latin1", 0, 2) === "#!") return { other: "a script" };
  if (buf.length >= 4 && buf.toString("latin1", 0, 4) === "%PDF") return { other: "a PDF document" };
  if (buf.length >= 4 && buf.toString("latin1", 0, 2) === "PK") return { other: "an archive" };
  if (buf.length >= 6 && /^GIF8[79]a/.test(buf.toString("latin1", 0, 6))) return { other: "a GIF image" };
  if (buf.length >= 12 && buf.toString("latin1", 4, 8) === "ftyp") return { other: "a HEIC/MP4 file" };
  return { other: "not an image we recognise" };
}

function label(name: string | undefined) {
  return name ? `“${name.slice(0, 80)}”` : "This file";
}

/** EXIF time as an ISO instant: with its offset tag when present, else in the harbour's zone. */
export function exifTimeToIso(raw: string | null, offset: string | null, zone: string): string | null {
  if (!raw) return null;
  const m = /^(\d{4}):(\d{2}):(\d{2})[ T](\d{2}):(\d{2}):(\d{2})/.exec(raw);
  if (!m) return null;
  const base = `${m[1]}-${m[2]}-${m[3]}T${m[4]}:${m[5]}:${m[6]}`;
  const dt = offset && /^[+-]\d{2}:\d{2}$/.test(offset) ? DateTime.fromISO(base + offset, { setZone: true }) : DateTime.fromISO(base, { zone });
  return dt.isValid ? dt.toUTC().toISO({ suppressMilliseconds: true }) : null;
}

async function readExif(buf: Buffer, format: PhotoFormat, zone: string): Promise<ProcessedPhoto["exif"]> {
  const empty = { lat: null, lon: null, takenAtRaw: null, takenAt: null };
  if (format === "webp") return empty; // exifr cannot read WebP (STACK.md)
  try {
    const gps = await exifr.gps(buf).catch(() => undefined);
    // reviveValues: false keeps the raw "YYYY:MM:DD hh:mm:ss" text; exifr would otherwise build a
    // Date in the server's own time zone (STACK.md).
    const tags = (await exifr
      .parse(buf, { pick: ["DateTimeOriginal", "OffsetTimeOriginal", "CreateDate", "OffsetTime"], reviveValues: false })
      .catch(() => undefined)) as Record<string, string> | undefined;
    const raw = tags?.DateTimeOriginal ?? tags?.CreateDate ?? null;
    const offset = tags?.OffsetTimeOriginal ?? tags?.OffsetTime ?? null;
    const lat = gps && Number.isFinite(gps.latitude) ? gps.latitude : null;
    const lon = gps && Number.isFinite(gps.longitude) ? gps.longitude : null;
    return {
      lat,
      lon,
      takenAtRaw: raw ? `${raw}${offset ?? ""}`.slice(0, 40) : null,
      takenAt: exifTimeToIso(raw, offset, zone),
    };
  } catch {
    return empty;
  }
}

/**
 * Checks a photo by its content and makes the public copy and thumbnail (rotated upright,
 * resized, re-encoded as JPEG without metadata). Throws PhotoRejectedError with a message for
 * the user.
 */
export async function processPhoto(buf: Buffer, opts: { name?: string; timeZone?: string } = {}): Promise<ProcessedPhoto> {
  const who = label(opts.name);
  if (buf.length === 0) throw new PhotoRejectedError(`${who} is empty.`);
  if (buf.length > MAX_PHOTO_BYTES) {
    throw new PhotoRejectedError(`${who} is ${(buf.length / 1024 / 1024).toFixed(1)} MB; photos can be at most 20 MB each.`);
  }
  const sniffed = sniffFormat(buf);
  if (typeof sniffed !== "string") {
    throw new PhotoRejectedError(`${who} is ${sniffed.other}, not a photo. Send JPEG, PNG or WebP images (the file's content is checked, not its name).`);
  }
  let meta: Metadata;
  try {
    meta = await sharp(buf, { limitInputPixels: false }).metadata();
  } catch {
    throw new PhotoRejectedError(`${who} looks like a ${sniffed.toUpperCase()} file but cannot be read: it may be damaged.`);
  }
  if (meta.format !== sniffed) {
    throw new PhotoRejectedError(`${who} is not a valid ${sniffed.toUpperCase()} image.`);
  }
  const width = meta.width ?? 0;
  const height = meta.height ?? 0;
  if (!width || !height) throw new PhotoRejectedError(`${who} has no image size: it may be damaged.`);
  if (width * height > MAX_PHOTO_PIXELS) {
    throw new PhotoRejectedError(
      `${who} is ${width.toLocaleString("en")} × ${height.toLocaleString("en")} pixels; the most we accept is ${MAX_PHOTO_PIXELS / 1_000_000} megapixels. Send a smaller copy.`,
    );
  }
  const exif = await readExif(buf, sniffed, opts.timeZone ?? "Europe/London");
  let publicJpeg: Buffer;
  let thumbJpeg: Buffer;
  try {
    // failOn "error": a truncated or corrupt file is refused rather than published half grey.
    publicJpeg = await sharp(buf, { limitInputPixels: MAX_PHOTO_PIXELS, failOn: "error", sequentialRead: true })
      .rotate()
      .resize({ width: PUBLIC_MAX_PX, height: PUBLIC_MAX_PX, fit: "inside", withoutEnlargement: true })
      .jpeg({ quality: 82 })
      .toBuffer();
    thumbJpeg = await sharp(publicJpeg)
      .resize({ width: THUMB_MAX_PX, height: THUMB_MAX_PX, fit: "inside", withoutEnlargement: true })
      .jpeg({ quality: 75 })
      .toBuffer();
  } catch (e) {
    const msg = String((e as Error).message ?? e);
    if (/premature end|truncat|unexpected end|corrupt|short read|EOF/i.test(msg)) {
      throw new PhotoRejectedError(`${who} is incomplete (the file was cut short, perhaps by an interrupted copy). Send the whole file.`);
    }
    if (/pixel limit/i.test(msg)) throw new PhotoRejectedError(`${who} has too many pixels; the most we accept is ${MAX_PHOTO_PIXELS / 1_000_000} megapixels.`);
    throw new PhotoRejectedError(`${who} cannot be read as an image: it may be damaged.`);
  }
  return {
    format: sniffed,
    contentType: PHOTO_CONTENT_TYPES[sniffed],
    bytes: buf.length,
    width,
    height,
    original: buf,
    publicJpeg,
    thumbJpeg,
    exif,
  };
}
