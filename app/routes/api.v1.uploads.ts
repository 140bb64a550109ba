// POST /api/v1/uploads — a photo for a report, before the report is sent.
//   multipart/form-data with one file field "photo": checked, processed and stored at once
//     (the browser form uses this, with a progress bar).
//   application/json { "contentType": "image/jpeg" }: a presigned PUT URL for clients outside
//     the browser; then POST /api/v1/uploads/{id}/complete.
// Either way the answer's id goes into the report's photoUploadIds. Uploads never attached are
// removed by the worker after some hours.
import { z } from "zod";
import type { Route } from "./+types/api.v1.uploads";
import { enforceRateLimit } from "~/services/rate-limit.server";
import { jsonError } from "~/lib/http";
import { getDefaultHarbour } from "~/models/harbour.server";
import { createPresignedUpload, storeProcessedPhoto, uploadBody } from "~/models/photo.server";
import { getOptionalUser } from "~/services/auth.server";
import { PhotoRejectedError, processPhoto } from "~/services/photo-processing.server";
import { STORAGE_UNAVAILABLE_MESSAGE, StorageUnavailableError } from "~/services/storage.server";

const presignSchema = z
  .object({ contentType: z.enum(["image/jpeg", "image/png", "image/webp"], { error: 'contentType must be "image/jpeg", "image/png" or "image/webp"' }) })
  .strict();

export async function loader() {
  return jsonError("Send a photo with POST (multipart field \"photo\"), or POST JSON { contentType } for a presigned upload", undefined, 405, { Allow: "POST" });
}

export async function action({ request, context }: Route.ActionArgs) {
  if (request.method !== "POST") return jsonError("Use POST", undefined, 405, { Allow: "POST" });
  await enforceRateLimit("upload", request, context);
  const user = await getOptionalUser(request);
  const harbour = await getDefaultHarbour();
  const zone = harbour?.timeZone ?? "Europe/London";
  const type = request.headers.get("Content-Type") ?? "";
  try {
    if (type.startsWith("application/json")) {
      const body = await request.json().catch(() => undefined);
      const parsed = presignSchema.safeParse(body);
      if (!parsed.success) return jsonError(parsed.error.issues[0]!.message, String(parsed.error.issues[0]!.path[0] ?? "contentType"));
      const p = await createPresignedUpload(parsed.data.contentType, user?.id ?? null);
      return Response.json(
        { id: p.id, upload: { url: p.url, method: p.method, headers: p.headers, expiresInS: p.expiresInS }, completeUrl: `/api/v1/uploads/${p.id}/complete` },
        { status: 201, headers: { "Cache-Control": "no-store" } },
      );
    }
    if (!type.startsWith("multipart/form-data")) {
      return jsonError('Send multipart/form-data with a file field "photo", or JSON { "contentType": … }', "Content-Type", 415);
    }
    const form = await request.formData().catch(() => null);
    if (!form) return jsonError("The upload could not be read: send it as multipart/form-data", "photo");
    const files = form.getAll("photo").filter((f): f is File => typeof f === "object" && f !== null && "arrayBuffer" in f);
    if (files.length === 0) return jsonError('Add the photo as the file field "photo"', "photo");
    if (files.length > 1) return jsonError("Send one photo per upload", "photo");
    const file = files[0]!;
    const processed = await processPhoto(Buffer.from(await file.arrayBuffer()), { name: file.name, timeZone: zone });
    const stored = await storeProcessedPhoto(processed, user?.id ?? null);
    return Response.json(uploadBody(stored, zone), { status: 201, headers: { "Cache-Control": "no-store" } });
  } catch (e) {
    if (e instanceof PhotoRejectedError) return jsonError(e.message, "photo", 400);
    if (e instanceof StorageUnavailableError) return jsonError(STORAGE_UNAVAILABLE_MESSAGE, "photo", 503, { "Retry-After": "30" });
    throw e;
  }
}
