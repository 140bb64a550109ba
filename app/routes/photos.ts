// GET /photos/{id}/{public|thumb} — only the resized public copy and the thumbnail (both
// re-encoded without metadata), never the original.
import type { Route } from "./+types/photos";
import { servableKey } from "~/models/photo.server";
import { getObject, StorageUnavailableError } from "~/services/storage.server";

const UUID = /^[0-9a-f]{8}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{12}$/i;

export async function loader({ params }: Route.LoaderArgs) {
  const size = params.size;
  if ((size !== "public" && size !== "thumb") || !UUID.test(params.id)) return new Response("Not found", { status: 404, headers: { "Content-Type": "text/plain" } });
  const key = await servableKey(params.id, size);
  if (!key) return new Response("Not found", { status: 404, headers: { "Content-Type": "text/plain" } });
  try {
    const obj = await getObject(key);
    if (!obj) return new Response("Not found", { status: 404, headers: { "Content-Type": "text/plain" } });
    return new Response(new Uint8Array(obj.body), {
      headers: {
        "Content-Type": "image/jpeg",
        "Content-Length": String(obj.body.length),
        "X-Content-Type-Options": "nosniff",
        "Content-Disposition": "inline",
        // The id is random and the bytes never change: cache for a day (private to the browser).
        "Cache-Control": "private, max-age=86400",
      },
    });
  } catch (e) {
    if (e instanceof StorageUnavailableError) return new Response("Photo storage unavailable", { status: 503, headers: { "Content-Type": "text/plain", "Retry-After": "30" } });
    throw e;
  }
}
