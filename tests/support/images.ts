// Test images generated with sharp at test time (no binary fixtures in the repository).
import { crc32 } from "node:zlib";
import sharp from "sharp";

/** A JPEG with EXIF GPS and time (IFD3 = GPS), like a phone photo. */
export async function jpegWithGps(o: { width?: number; height?: number; lat?: number; lon?: number; takenAt?: string; orientation?: number } = {}): Promise<Buffer> {
  const lat = o.lat ?? 55.1921;
  const lon = o.lon ?? 3.0123;
  const dms = (v: number) => {
    const a = Math.abs(v);
    const d = Math.floor(a);
    const m = Math.floor((a - d) * 60);
    const s = ((a - d) * 60 - m) * 60;
    return `${d}/1 ${m}/1 ${Math.round(s * 100)}/100`;
  };
  const w = o.width ?? 1200;
  const h = o.height ?? 900;
  return sharp({ create: { width: w, height: h, channels: 3, background: { r: 40, g: 110, b: 160 } } })
    .composite([{ input: Buffer.from(`<svg width="${w}" height="${h}"><circle cx="${w / 2}" cy="${h / 2}" r="${Math.min(w, h) / 4}" fill="#c33"/></svg>`) }])
    .withExif({
      IFD0: { Make: "TestCam", Model: "Phone", ...(o.orientation ? { Orientation: String(o.orientation) } : {}) },
      IFD2: { DateTimeOriginal: o.takenAt ?? "2026:11:30 14:05:00", OffsetTimeOriginal: "+00:00" },
      IFD3: {
        GPSLatitudeRef: lat >= 0 ? "N" : "S",
        GPSLatitude: dms(lat),
        GPSLongitudeRef: lon >= 0 ? "E" : "W",
        GPSLongitude: dms(lon),
      },
    })
    .jpeg({ quality: 90 })
    .toBuffer();
}

export async function png(width = 64, height = 48): Promise<Buffer> {
  return sharp({ create: { width, height, channels: 3, background: "#2a7" } }).png().toBuffer();
}

export async function webp(width = 64, height = 48): Promise<Buffer> {
  return sharp({ create: { width, height, channels: 3, background: "#72a" } }).webp().toBuffer();
}

/**
 * A PNG whose header claims 30 000 × 30 000 pixels (900 megapixels): tiny on disk, a bomb when
 * decoded. Made from a small PNG by rewriting the IHDR size and its CRC.
 */
export async function hugePng(width = 30_000, height = 30_000): Promise<Buffer> {
  const b = Buffer.from(await png(16, 16));
  // signature (8) + length (4) + "IHDR" (4) → width at 16, height at 20; CRC after the 13 data bytes.
  b.writeUInt32BE(width, 16);
  b.writeUInt32BE(height, 20);
  b.writeUInt32BE(crc32(b.subarray(12, 29)) >>> 0, 29);
  return b;
}

/** A JPEG cut short half-way (an interrupted copy). */
export async function truncatedJpeg(): Promise<Buffer> {
  const full = await jpegWithGps({ width: 800, height: 600 });
  return full.subarray(0, Math.floor(full.length / 2));
}

/** A Windows executable renamed to .jpg: "MZ" header and junk. */
export function fakeExecutable(): Buffer {
  const b = Buffer.alloc(4096, 0x90);
  b.write("MZ", 0, "latin1");
  b.write("This program cannot be run in DOS mode.", 78, "latin1");
  return b;
}
