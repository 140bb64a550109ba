// `npm run bench:photo`: processing one 12-megapixel phone-like JPEG the way a report upload is
// processed (content checks, EXIF read, rotate, resize, strip, public copy and thumbnail).
// Goal: under 1 s on this machine. Prints times and the process's peak memory.
import exifr from "exifr";
import sharp from "sharp";
import { processPhoto } from "../app/services/photo-processing.server";

const RUNS = Number(process.env.BENCH_RUNS ?? 7);

async function phoneJpeg(): Promise<Buffer> {
  // 4000 × 3000 = 12 MP of gaussian noise: compresses like a busy photo (several MB).
  const noise = await sharp({ create: { width: 4000, height: 3000, channels: 3, background: "#000", noise: { type: "gaussian", mean: 120, sigma: 40 } } })
    .jpeg({ quality: 90 })
    .toBuffer();
  return sharp(noise)
    .withExif({
      IFD0: { Make: "BenchCam", Model: "Phone 12MP" },
      IFD2: { DateTimeOriginal: "2026:11:30 14:05:00", OffsetTimeOriginal: "+00:00" },
      IFD3: { GPSLatitudeRef: "N", GPSLatitude: "55/1 11/1 3120/100", GPSLongitudeRef: "E", GPSLongitude: "3/1 0/1 4980/100" },
    })
    .withMetadata({ orientation: 6 }) // held in portrait: rotate() must turn it upright
    .jpeg({ quality: 90 })
    .toBuffer();
}

const mb = (bytes: number) => `${(bytes / 1024 / 1024).toFixed(1)} MB`;

const input = await phoneJpeg();
const meta = await sharp(input).metadata();
console.log(`input: ${meta.width} × ${meta.height} JPEG (${((meta.width! * meta.height!) / 1e6).toFixed(1)} MP), ${mb(input.length)}, EXIF orientation ${meta.orientation}`);
const rssBefore = process.memoryUsage().rss;
const times: number[] = [];
let last: Awaited<ReturnType<typeof processPhoto>> | null = null;
for (let i = 0; i < RUNS; i++) {
  const t = performance.now();
  last = await processPhoto(input, { name: "bench.jpg", timeZone: "Europe/London" });
  times.push(performance.now() - t);
}
times.sort((a, b) => a - b);
const peakRssBytes = process.resourceUsage().maxRSS * 1024;
const pub = await sharp(last!.publicJpeg).metadata();
const thumb = await sharp(last!.thumbJpeg).metadata();
const gpsLeft = await exifr.gps(last!.publicJpeg);
console.log(`outputs: public ${pub.width} × ${pub.height} (${mb(last!.publicJpeg.length)}), thumbnail ${thumb.width} × ${thumb.height} (${(last!.thumbJpeg.length / 1024).toFixed(0)} kB); GPS in public copy: ${gpsLeft ? "YES (defect)" : "none"}; EXIF GPS read: ${last!.exif.lat?.toFixed(5)}, ${last!.exif.lon?.toFixed(5)}`);
console.log(`time per photo over ${RUNS} runs: median ${times[Math.floor(RUNS / 2)]!.toFixed(0)} ms, min ${times[0]!.toFixed(0)} ms, max ${times[RUNS - 1]!.toFixed(0)} ms (goal < 1000 ms)`);
console.log(`memory: RSS before ${mb(rssBefore)}, peak RSS of the process ${mb(peakRssBytes)} (includes generating the input), sharp cache ${JSON.stringify(sharp.cache())}`);
console.log(`verdict: ${times[Math.floor(RUNS / 2)]! < 1000 ? "goal met" : "goal NOT met"}`);
