/**
 * Tidewire's own map symbols as small SVGs. Aids use the IALA buoyage colours and shapes
 * (IALA Maritime Buoyage System, summarised in ../shared/TRADE.md); the drawings are ours.
 * Pure: no OpenLayers here, so the symbols can be shown in legends without loading the map.
 */

const R = "#c8102e"; // red
const G = "#00843d"; // green
const Y = "#f2c500"; // yellow
const K = "#111111"; // black
const W = "#ffffff";
const B = "#1f4fbf"; // blue

function svg(body: string, w = 28, h = 36): string {
  return `<svg xmlns="http://www.w3.org/2000/svg" width="${w}" height="${h}" viewBox="0 0 ${w} ${h}">${body}</svg>`;
}
const cone = (x: number, y: number, up: boolean, fill = K) =>
  up ? `<path d="M${x - 4} ${y + 4} L${x} ${y - 3} L${x + 4} ${y + 4} Z" fill="${fill}"/>` : `<path d="M${x - 4} ${y - 3} L${x} ${y + 4} L${x + 4} ${y - 3} Z" fill="${fill}"/>`;
const stroke = `stroke="${K}" stroke-width="1"`;
const body = (bands: string[]) => {
  // A buoy body from top to bottom in equal horizontal bands, 10 px wide × 14 px high.
  const h = 14 / bands.length;
  return bands.map((c, i) => `<rect x="9" y="${20 + i * h}" width="10" height="${h}" fill="${c}"/>`).join("") + `<rect x="9" y="20" width="10" height="14" fill="none" ${stroke}/>`;
};
const vstripes = (a: string, b: string) =>
  [0, 1, 2, 3].map((i) => `<rect x="${9 + i * 2.5}" y="20" width="2.5" height="14" fill="${i % 2 ? b : a}"/>`).join("") + `<rect x="9" y="20" width="10" height="14" fill="none" ${stroke}/>`;

export const AID_SYMBOLS: Record<string, string> = {
  port: svg(`<rect x="8" y="14" width="12" height="18" fill="${R}" ${stroke}/>`),
  starboard: svg(`<path d="M8 32 L14 12 L20 32 Z" fill="${G}" ${stroke}/>`),
  preferred_channel_port: svg(`<rect x="8" y="14" width="12" height="18" fill="${R}" ${stroke}/><rect x="8" y="20" width="12" height="5" fill="${G}"/>`),
  preferred_channel_starboard: svg(`<path d="M8 32 L14 12 L20 32 Z" fill="${G}" ${stroke}/><rect x="10.5" y="22" width="7" height="4" fill="${R}"/>`),
  north_cardinal: svg(cone(14, 5, true) + cone(14, 13, true) + body([K, Y])),
  east_cardinal: svg(cone(14, 5, true) + cone(14, 13, false) + body([K, Y, K])),
  south_cardinal: svg(cone(14, 5, false) + cone(14, 13, false) + body([Y, K])),
  west_cardinal: svg(cone(14, 5, false) + cone(14, 13, true) + body([Y, K, Y])),
  isolated_danger: svg(`<circle cx="14" cy="5" r="3" fill="${K}"/><circle cx="14" cy="13" r="3" fill="${K}"/>` + body([K, R, K])),
  safe_water: svg(`<circle cx="14" cy="12" r="4" fill="${R}"/>` + vstripes(R, W)),
  special: svg(`<path d="M10 6 L18 14 M18 6 L10 14" stroke="${Y}" stroke-width="2.5"/><path d="M10 6 L18 14 M18 6 L10 14" stroke="${K}" stroke-width="0.6"/>` + body([Y])),
  emergency_wreck: svg(`<path d="M14 5 L14 16 M9 10.5 L19 10.5" stroke="${Y}" stroke-width="3"/>` + vstripes(B, Y)),
  light: svg(`<path d="M14 4 L16.5 12 L24 12 L18 17 L20.5 25 L14 20 L7.5 25 L10 17 L4 12 L11.5 12 Z" fill="${Y}" ${stroke}/>`, 28, 28),
};

export function aidSymbol(category: string | null | undefined, aidType?: string | null): string {
  if (category && AID_SYMBOLS[category]) return AID_SYMBOLS[category]!;
  return AID_SYMBOLS.light!;
}

export function svgDataUri(s: string): string {
  return `data:image/svg+xml;charset=utf-8,${encodeURIComponent(s)}`;
}

/** Colours of notices on the map and in legends (urgent uses the signal colour AND the word URGENT in text). */
export const NOTICE_COLOURS = {
  urgent: "#b4410b",
  routine: "#0b4f6c",
  ended: "#6b7780",
  draft: "#1b7f93",
} as const;

/** A notice point symbol: a diamond; urgent notices carry "!" and a thicker outline. */
export function noticePointSymbol(urgent: boolean, ended: boolean): string {
  const c = ended ? NOTICE_COLOURS.ended : urgent ? NOTICE_COLOURS.urgent : NOTICE_COLOURS.routine;
  const mark = urgent ? `<text x="14" y="19" text-anchor="middle" font-family="sans-serif" font-weight="700" font-size="13" fill="#fff">!</text>` : `<circle cx="14" cy="14" r="2.5" fill="#fff"/>`;
  return svg(`<path d="M14 2 L26 14 L14 26 L2 14 Z" fill="${c}" stroke="#fff" stroke-width="${urgent ? 2.5 : 1.5}"/>${mark}`, 28, 28);
}
