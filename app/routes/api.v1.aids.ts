// GET /api/v1/aids — the aids register as GeoJSON (WGS 84, RFC 7946), with the charted
// position as entered and its datum, the parsed light characteristic and the swing radius.
import type { Route } from "./+types/api.v1.aids";
import { AID_STATUS_LABELS, IALA_CATEGORY_LABELS } from "~/lib/aids/iala";
import { aidLight, aidSwingRadiusM, listAids } from "~/models/aid.server";
import { getDefaultHarbour } from "~/models/harbour.server";
import { cachedResponse } from "~/services/http-cache.server";

export async function loader({ request }: Route.LoaderArgs) {
  const harbour = await getDefaultHarbour();
  const url = new URL(request.url);
  const includeWithdrawn = url.searchParams.get("withdrawn") === "include";
  const aids = harbour ? await listAids(harbour.id, { includeWithdrawn }) : [];
  const body = {
    type: "FeatureCollection",
    caution: "Tidewire informs; it does not replace official charts, official notices, local regulations or a proper lookout.",
    features: aids.map((a) => {
      const light = aidLight(a);
      return {
        type: "Feature",
        id: a.code,
        geometry: { type: "Point", coordinates: [Number(a.lon.toFixed(7)), Number(a.lat.toFixed(7))] },
        properties: {
          code: a.code,
          name: a.name,
          aidType: a.aidType,
          ialaCategory: a.ialaCategory,
          ialaCategoryLabel: a.ialaCategory ? IALA_CATEGORY_LABELS[a.ialaCategory] : null,
          ialaRegion: a.ialaRegion,
          light: light
            ? { text: light.text, rhythm: light.rhythm, group: light.group, colours: light.colours, periodS: light.periodS, description: light.description }
            : null,
          chartedPosition: { text: a.chartedPositionText, crs: a.chartedCrs },
          swingRadiusM: aidSwingRadiusM(a),
          mooring: a.chainLengthM !== null ? { chainLengthM: a.chainLengthM, depthM: a.depthM } : null,
          status: a.status,
          statusLabel: AID_STATUS_LABELS[a.status],
          updatedAt: a.updatedAt.toISOString(),
          reportUrl: `/report?aid=${encodeURIComponent(a.code)}`,
        },
      };
    }),
  };
  return cachedResponse(request, JSON.stringify(body), {
    contentType: "application/geo+json; charset=utf-8",
    maxAgeS: 60,
    lastModified: aids.reduce<Date | null>((m, a) => (!m || a.updatedAt > m ? a.updatedAt : m), null),
    extraHeaders: { "Access-Control-Allow-Origin": "*" },
  });
}
