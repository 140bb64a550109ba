// POST /api/v1/uploads/{id}/complete — after the client PUT the photo to its presigned URL:
// the bytes are checked and processed exactly like a browser upload.
import type { Route } from "./+types/api.v1.uploads.complete";
import { jsonError } from "~/lib/http";
import { getDefaultHarbour } from "~/models/harbour.server";
import { completePresignedUpload, UploadProblem, uploadBody } from "~/models/photo.server";
import { STORAGE_UNAVAILABLE_MESSAGE, StorageUnavailableError } from "~/services/storage.server";

const UUID = /^[0-9a-f]{8}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{12}$/i;

export async function action({ request, params }: Route.ActionArgs) {
  if (request.method !== "POST") return jsonError("Use POST", undefined, 405, { Allow: "POST" });
  if (!UUID.test(params.id)) return jsonError("No such upload", "id", 404);
  const zone = (await getDefaultHarbour())?.timeZone ?? "Europe/London";
  try {
    const stored = await completePresignedUpload(params.id, zone);
    return Response.json(uploadBody(stored, zone), { headers: { "Cache-Control": "no-store" } });
  } catch (e) {
    if (e instanceof UploadProblem) return jsonError(e.message, "photo", e.status);
    if (e instanceof StorageUnavailableError) return jsonError(STORAGE_UNAVAILABLE_MESSAGE, "photo", 503, { "Retry-After": "30" });
    throw e;
  }
}
