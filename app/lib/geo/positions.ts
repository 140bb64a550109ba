/**
 * Positions as mariners write them: parse and format decimal degrees (DD), degrees and decimal
 * minutes (DDM), degrees-minutes-seconds (DMS) and the broadcast form used in navigational
 * warnings (`50-47.12N 001-06.45W`).
 *
 * Parsing rules (documented in the tools page and the API docs):
 * - Degree marks ° º ˚, minute marks ′ ' ’ ‘ ´, second marks ″ " ” “ (or two minute marks).
 * - Hemisphere letters N S E W (or the words north, south, east, west) before or after each
 *   value; or signs (+/-, −) with no letters. Letters and a minus sign on the same value are
 *   refused as contradictory.
 * - Latitude comes first unless the text says otherwise: by hemisphere letters
 *   (`1°06.45′W 50°47.12′N`) or by labels (`lon -1.1 lat 50.8`).
 * - The two values are told apart by hemisphere letters, labels, one separator (`,` `;` `/`),
 *   degree marks, broadcast dashes, or — for bare numbers — by count: 2 (DD), 4 (DDM), 6 (DMS).
 * - A comma between two digits is a decimal comma only when the text has no `.` at all.
 */

export type Axis = "lat" | "lon";
export type Hemisphere = "N" | "S" | "E" | "W";

export type PositionErrorCode =
  | "empty"
  | "invalid_character"
  | "incomplete"
  | "ambiguous"
  | "minutes_out_of_range"
  | "seconds_out_of_range"
  | "latitude_out_of_range"
  | "longitude_out_of_range"
  | "wrong_axis"
  | "fraction_before_minutes"
  | "sign_and_hemisphere"
  | "too_long";

export type PositionParseResult =
  | { ok: true; lat: number; lon: number }
  | { ok: false; error: string; code: PositionErrorCode };

export class PositionParseError extends Error {
  readonly code: PositionErrorCode;
  constructor(message: string, code: PositionErrorCode) {
    super(message);
    this.name = "PositionParseError";
    this.code = code;
  }
}

/** Longest text we try to read: a position with labels and marks is well under this. */
export const MAX_POSITION_TEXT_LENGTH = 200;

// ---------------------------------------------------------------------------------------------
// Tokenizer

type NumTok = { t: "num"; v: number; neg: boolean; signed: boolean; int: boolean; dash: boolean; raw: string };
type MarkTok = { t: "deg" | "min" | "sec" };
type HemiTok = { t: "hemi"; v: Hemisphere };
type LabelTok = { t: "label"; axis: Axis };
type SepTok = { t: "sep" };
/** Broadcast joiner between degrees and minutes (`50-47.12N`); consumed by the next number. */
type DashTok = { t: "dash" };
type Tok = NumTok | MarkTok | HemiTok | LabelTok | SepTok | DashTok;

const DEGREE_MARKS = new Set(["°", "º", "˚"]);
const MINUTE_MARKS = new Set(["′", "'", "’", "‘", "´", "ʹ"]);
const SECOND_MARKS = new Set(["″", '"', "”", "“", "ʺ", "‶"]);
const MINUS_SIGNS = new Set(["-", "−", "–", "—"]);
const SEPARATORS = new Set([",", ";", "/"]);
const IGNORED = new Set([":", "=", "(", ")", "[", "]"]);

const WORDS: Record<string, Tok> = {
  N: { t: "hemi", v: "N" },
  S: { t: "hemi", v: "S" },
  E: { t: "hemi", v: "E" },
  W: { t: "hemi", v: "W" },
  NORTH: { t: "hemi", v: "N" },
  SOUTH: { t: "hemi", v: "S" },
  EAST: { t: "hemi", v: "E" },
  WEST: { t: "hemi", v: "W" },
  LAT: { t: "label", axis: "lat" },
  LATITUDE: { t: "label", axis: "lat" },
  LON: { t: "label", axis: "lon" },
  LONG: { t: "label", axis: "lon" },
  LNG: { t: "label", axis: "lon" },
  LONGITUDE: { t: "label", axis: "lon" },
};

function isDigit(c: string | undefined): boolean {
  return c !== undefined && c >= "0" && c <= "9";
}
function isSpace(c: string): boolean {
  const k = c.charCodeAt(0);
  return k === 32 || (k >= 9 && k <= 13) || k === 0xa0 || k === 0x1680 || (k >= 0x2000 && k <= 0x200a) || k === 0x2028 || k === 0x2029 || k === 0x202f || k === 0x205f || k === 0x3000 || k === 0xfeff;
}
function isLetter(c: string | undefined): boolean {
  if (c === undefined) return false;
  const k = c.charCodeAt(0);
  return (k >= 65 && k <= 90) || (k >= 97 && k <= 122);
}

class Fail extends Error {
  constructor(
    message: string,
    readonly code: PositionErrorCode,
  ) {
    super(message);
  }
}

function tokenize(text: string): Tok[] {
  const s = text;
  const decimalComma = !s.includes(".");
  const toks: Tok[] = [];
  let i = 0;
  let pendingSign: "-" | "+" | null = null;
  let lastWasNumAdjacent = false; // previous token is a number and nothing (not even space) since

  while (i < s.length) {
    const c = s[i]!;
    if (isSpace(c)) {
      i++;
      lastWasNumAdjacent = false;
      continue;
    }
    if (isDigit(c) || (c === "." && isDigit(s[i + 1]))) {
      let j = i;
      let raw = "";
      let seenPoint = false;
      while (j < s.length) {
        const d = s[j]!;
        if (isDigit(d)) {
          raw += d;
          j++;
        } else if (d === "." && !seenPoint && isDigit(s[j + 1])) {
          raw += ".";
          seenPoint = true;
          j++;
        } else if (d === "," && decimalComma && !seenPoint && raw.length > 0 && isDigit(s[j + 1])) {
          raw += ".";
          seenPoint = true;
          j++;
        } else {
          break;
        }
      }
      if (s[j] === ".") {
        throw new Fail(`Unexpected "." after ${raw}`, "invalid_character");
      }
      const dash = pendingSign === null && lastDash(toks);
      const tok: NumTok = {
        t: "num",
        v: Number(raw),
        neg: pendingSign === "-",
        signed: pendingSign !== null,
        int: !seenPoint,
        dash,
        raw,
      };
      if (dash) popDash(toks);
      toks.push(tok);
      pendingSign = null;
      i = j;
      lastWasNumAdjacent = true;
      continue;
    }
    if (MINUS_SIGNS.has(c) || c === "+") {
      const next = s[i + 1];
      const nextIsNum = isDigit(next) || (next === "." && isDigit(s[i + 2]));
      if (c !== "+" && lastWasNumAdjacent && nextIsNum) {
        // Broadcast form: 50-47.12N joins degrees and minutes with a dash.
        toks.push({ t: "dash" });
        i++;
        lastWasNumAdjacent = false;
        continue;
      }
      if (!nextIsNum) throw new Fail(`Unexpected "${c}"`, "invalid_character");
      pendingSign = c === "+" ? "+" : "-";
      i++;
      lastWasNumAdjacent = false;
      continue;
    }
    if (DEGREE_MARKS.has(c)) {
      toks.push({ t: "deg" });
      i++;
      lastWasNumAdjacent = false;
      continue;
    }
    if (MINUTE_MARKS.has(c)) {
      // Two minute marks in a row are a seconds mark ('' for ″).
      if (MINUTE_MARKS.has(s[i + 1] ?? "")) {
        toks.push({ t: "sec" });
        i += 2;
      } else {
        toks.push({ t: "min" });
        i++;
      }
      lastWasNumAdjacent = false;
      continue;
    }
    if (SECOND_MARKS.has(c)) {
      toks.push({ t: "sec" });
      i++;
      lastWasNumAdjacent = false;
      continue;
    }
    if (SEPARATORS.has(c)) {
      toks.push({ t: "sep" });
      i++;
      lastWasNumAdjacent = false;
      continue;
    }
    if (IGNORED.has(c)) {
      i++;
      lastWasNumAdjacent = false;
      continue;
    }
    if (isLetter(c)) {
      let j = i;
      while (j < s.length && isLetter(s[j])) j++;
      const word = s.slice(i, j).toUpperCase();
      const tok = WORDS[word];
      if (!tok) throw new Fail(`Unexpected "${s.slice(i, j)}"`, "invalid_character");
      toks.push(tok);
      i = j;
      lastWasNumAdjacent = false;
      continue;
    }
    throw new Fail(`Unexpected character "${c}"`, "invalid_character");
  }
  // A sign is only taken when a number follows, and a dash only between two numbers, so
  // neither can be left over here.
  return toks;
}

function lastDash(toks: Tok[]): boolean {
  return toks[toks.length - 1]?.t === "dash";
}
function popDash(toks: Tok[]): void {
  toks.pop();
}

// ---------------------------------------------------------------------------------------------
// Components

type Component = { toks: Tok[]; hemi?: Hemisphere; label?: Axis };

function axisOfHemi(h: Hemisphere): Axis {
  return h === "N" || h === "S" ? "lat" : "lon";
}

function splitComponents(toks: Tok[]): Component[] {
  const hemis = toks.filter((t): t is HemiTok => t.t === "hemi");
  const labels = toks.filter((t): t is LabelTok => t.t === "label");
  const nums = toks.filter((t) => t.t === "num");

  if (nums.length === 0) throw new Fail("Give a latitude and a longitude", "incomplete");

  if (labels.length > 0) {
    if (labels.length === 1) throw new Fail("Label both values (lat and lon), or neither", "incomplete");
    if (labels.length > 2) throw new Fail("Too many lat/lon labels", "ambiguous");
    const l1 = toks.findIndex((t) => t.t === "label");
    const l2 = toks.findIndex((t, k) => k > l1 && t.t === "label");
    if (toks.slice(0, l1).some((t) => t.t !== "sep")) {
      throw new Fail("Put each lat/lon label before its value", "ambiguous");
    }
    return [toks.slice(l1, l2), toks.slice(l2)].map((part) => {
      const hs = part.filter((t): t is HemiTok => t.t === "hemi");
      if (hs.length > 1) throw new Fail("Too many hemisphere letters", "ambiguous");
      return withLabel({ toks: part.filter((t) => t.t !== "hemi"), hemi: hs[0]?.v });
    });
  }

  if (hemis.length > 0) {
    if (hemis.length === 1) {
      throw new Fail(
        "Give hemisphere letters for both latitude (N/S) and longitude (E/W), or use signs for both",
        "incomplete",
      );
    }
    if (hemis.length > 2) throw new Fail("Too many hemisphere letters", "ambiguous");
    const first = toks.findIndex((t) => t.t !== "sep");
    const h1 = toks.findIndex((t) => t.t === "hemi");
    const h2 = toks.findIndex((t, k) => k > h1 && t.t === "hemi");
    let a: Tok[];
    let b: Tok[];
    if (first === h1) {
      // Prefix style: N50°47.12′ W001°06.45′
      a = toks.slice(h1 + 1, h2);
      b = toks.slice(h2 + 1);
    } else {
      // Suffix style: 50°47.12′N 001°06.45′W
      a = toks.slice(0, h1);
      b = toks.slice(h1 + 1, h2);
      const rest = toks.slice(h2 + 1).filter((t) => t.t !== "sep");
      if (rest.length > 0) throw new Fail("Unexpected text after the second hemisphere letter", "ambiguous");
    }
    return [
      { toks: a, hemi: (toks[h1] as HemiTok).v },
      { toks: b, hemi: (toks[h2] as HemiTok).v },
    ].map(withLabel);
  }

  const seps = toks.filter((t) => t.t === "sep");
  if (seps.length > 0) {
    const trimmed = trimSeps(toks);
    const k = trimmed.findIndex((t) => t.t === "sep");
    if (k < 0) return splitBare(trimmed);
    if (trimmed.slice(k + 1).some((t) => t.t === "sep")) {
      throw new Fail("Use one separator between latitude and longitude", "ambiguous");
    }
    return [{ toks: trimmed.slice(0, k) }, { toks: trimmed.slice(k + 1) }];
  }

  return splitBare(toks);
}

function trimSeps(toks: Tok[]): Tok[] {
  let a = 0;
  let b = toks.length;
  while (a < b && toks[a]!.t === "sep") a++;
  while (b > a && toks[b - 1]!.t === "sep") b--;
  return toks.slice(a, b);
}

/** Drop separators and take the component's label (each labelled part holds exactly one). */
function withLabel(c: Component): Component {
  let label: Axis | undefined;
  const toks: Tok[] = [];
  for (const t of c.toks) {
    if (t.t === "label") label = t.axis;
    else if (t.t !== "sep") toks.push(t);
  }
  return { toks, hemi: c.hemi, label };
}

/** No letters, labels or separators: split by degree marks, broadcast dashes or count. */
function splitBare(toks: Tok[]): Component[] {
  const nums = toks
    .map((t, k) => ({ t, k }))
    .filter((x): x is { t: NumTok; k: number } => x.t.t === "num");
  const degMarked = nums.filter((x) => toks[x.k + 1]?.t === "deg");
  if (degMarked.length > 0) {
    if (degMarked.length !== 2) {
      throw new Fail(
        degMarked.length === 1
          ? "Give both latitude and longitude, each with its degrees"
          : "Too many degree values",
        degMarked.length === 1 ? "incomplete" : "ambiguous",
      );
    }
    if (degMarked[0]!.k !== nums[0]!.k) throw new Fail("Start each value with its degrees", "ambiguous");
    const cut = degMarked[1]!.k;
    return [{ toks: toks.slice(0, cut) }, { toks: toks.slice(cut) }];
  }
  if (nums.some((x) => x.t.dash)) {
    // Broadcast form without letters: 50-47.12 001-06.45
    const starts = nums.filter((x) => !x.t.dash);
    if (starts.length !== 2) throw new Fail("Give exactly two values (latitude and longitude)", starts.length < 2 ? "incomplete" : "ambiguous");
    const cut = starts[1]!.k;
    return [{ toks: toks.slice(0, cut) }, { toks: toks.slice(cut) }];
  }
  const n = nums.length;
  if (n === 1) throw new Fail("Give both latitude and longitude", "incomplete");
  if (n === 2 || n === 4 || n === 6) {
    const cut = nums[n / 2]!.k;
    return [{ toks: toks.slice(0, cut) }, { toks: toks.slice(cut) }];
  }
  throw new Fail(
    `Cannot tell latitude from longitude in ${n} numbers: use hemisphere letters, degree marks or a comma`,
    "ambiguous",
  );
}

type Fields = { neg: boolean; signed: boolean; deg: NumTok; min?: NumTok; sec?: NumTok };

function readFields(c: Component, which: string): Fields {
  const toks = c.toks;
  if (toks.length === 0) throw new Fail(`The ${which} has no value`, "incomplete");
  const slots: (NumTok | undefined)[] = [undefined, undefined, undefined];
  let next = 0; // next slot for an unmarked number
  let k = 0;
  let count = 0;
  while (k < toks.length) {
    const t = toks[k]!;
    if (t.t !== "num") {
      throw new Fail(`Unexpected ${markName(t)} in the ${which}`, "ambiguous");
    }
    count++;
    if (count > 3) throw new Fail(`Too many numbers in the ${which}`, "ambiguous");
    const mark = toks[k + 1];
    let slot = next;
    if (t.dash) slot = Math.max(next, 1);
    if (mark && (mark.t === "deg" || mark.t === "min" || mark.t === "sec")) {
      slot = mark.t === "deg" ? 0 : mark.t === "min" ? 1 : 2;
      k += 2;
    } else {
      k += 1;
    }
    if (slot < next || slot > 2 || slots[slot] !== undefined) {
      throw new Fail(`Degrees, minutes and seconds are out of order in the ${which}`, "ambiguous");
    }
    if (slot > 0 && slots[slot - 1] === undefined) {
      throw new Fail(`The ${which} has ${slot === 1 ? "minutes" : "seconds"} without ${slot === 1 ? "degrees" : "minutes"}`, "ambiguous");
    }
    slots[slot] = t;
    next = slot + 1;
  }
  // Slot 0 is always filled: a later slot without the one before it was refused above.
  const deg = slots[0]!;
  const [, min, sec] = slots;
  for (const f of [min, sec]) {
    if (f?.signed) throw new Fail(`Only the degrees of the ${which} may carry a sign`, "ambiguous");
  }
  return { neg: deg.neg, signed: deg.signed, deg, min, sec };
}

function markName(t: Tok): string {
  switch (t.t) {
    case "deg":
      return "degree mark";
    case "min":
      return "minute mark";
    case "sec":
      return "second mark";
    case "hemi":
      return `letter ${t.v}`;
    case "label":
      return "label";
    case "sep":
    case "dash":
      return "separator";
    default:
      return "text";
  }
}

function valueOf(f: Fields, which: string): { abs: number } {
  if (f.min) {
    if (!f.deg.int) {
      throw new Fail(`Degrees must be whole when minutes follow (${which}: ${f.deg.raw}°)`, "fraction_before_minutes");
    }
    if (f.min.v >= 60) {
      throw new Fail(`Minutes must be less than 60 (${which}: ${f.min.raw}′)`, "minutes_out_of_range");
    }
  }
  if (f.sec) {
    if (!f.min!.int) {
      throw new Fail(`Minutes must be whole when seconds follow (${which}: ${f.min!.raw}′)`, "fraction_before_minutes");
    }
    if (f.sec.v >= 60) {
      throw new Fail(`Seconds must be less than 60 (${which}: ${f.sec.raw}″)`, "seconds_out_of_range");
    }
  }
  return { abs: f.deg.v + (f.min?.v ?? 0) / 60 + (f.sec?.v ?? 0) / 3600 };
}

/**
 * Parse a position. Never throws; returns `{ ok: false, error, code }` with a message fit to
 * show beside the field.
 */
export function parsePosition(text: string): PositionParseResult {
  const fast = typeof text === "string" && text.length <= MAX_POSITION_TEXT_LENGTH ? fastPath(text) : null;
  if (fast) return fast;
  try {
    const [lat, lon] = parseInner(text);
    return { ok: true, lat, lon };
  } catch (e) {
    if (e instanceof Fail) return { ok: false, error: e.message, code: e.code };
    throw e;
  }
}

// The two commonest shapes (DDM/broadcast with hemisphere letters, and signed DD) have a
// regex fast path. It only ever accepts: anything unusual, and every error, goes through the
// general parser, and the property tests check both give identical numbers.
const FAST_DDM =
  /^\s*(\d{1,2})(?:[°º˚]\s*|\s+|-)(\d{1,2}(?:\.\d+)?)\s*[′'’]?\s*([NSns])\s*,?\s*(\d{1,3})(?:[°º˚]\s*|\s+|-)(\d{1,2}(?:\.\d+)?)\s*[′'’]?\s*([EWew])\s*$/;
const FAST_DD = /^\s*([+-]?\d{1,3}(?:\.\d+)?)(?:\s*,\s+|\s+)([+-]?\d{1,3}(?:\.\d+)?)\s*$/;

function fastPath(text: string): PositionParseResult | null {
  let m = FAST_DDM.exec(text);
  if (m) {
    const latMin = Number(m[2]);
    const lonMin = Number(m[5]);
    if (latMin >= 60 || lonMin >= 60) return null;
    const latAbs = Number(m[1]) + latMin / 60;
    const lonAbs = Number(m[4]) + lonMin / 60;
    if (latAbs > 90 || lonAbs > 180) return null;
    const lat = m[3] === "S" || m[3] === "s" ? -latAbs : latAbs;
    const lon = m[6] === "W" || m[6] === "w" ? -lonAbs : lonAbs;
    return { ok: true, lat: lat + 0, lon: lon + 0 };
  }
  m = FAST_DD.exec(text);
  if (m) {
    const lat = Number(m[1]);
    const lon = Number(m[2]);
    if (Math.abs(lat) > 90 || Math.abs(lon) > 180) return null;
    return { ok: true, lat: lat + 0, lon: lon + 0 };
  }
  return null;
}

/** The general parser alone (no fast path); exported for tests. */
export function parsePositionGeneral(text: string): PositionParseResult {
  try {
    const [lat, lon] = parseInner(text);
    return { ok: true, lat, lon };
  } catch (e) {
    if (e instanceof Fail) return { ok: false, error: e.message, code: e.code };
    throw e;
  }
}

/** Parse a position or throw a PositionParseError. */
export function parsePositionOrThrow(text: string): { lat: number; lon: number } {
  const r = parsePosition(text);
  if (!r.ok) throw new PositionParseError(r.error, r.code);
  return { lat: r.lat, lon: r.lon };
}

function parseInner(text: string): [number, number] {
  if (typeof text !== "string" || text.trim() === "") throw new Fail("Enter a position", "empty");
  if (text.length > MAX_POSITION_TEXT_LENGTH) throw new Fail("This position is too long", "too_long");
  const toks = tokenize(text.trim());
  const comps = splitComponents(toks);
  if (comps.length !== 2) throw new Fail("Give both latitude and longitude", "incomplete");

  // Axis of each component: letter, then label, then position (latitude first).
  const axes: Axis[] = comps.map((c, k) => {
    const byHemi = c.hemi ? axisOfHemi(c.hemi) : undefined;
    if (byHemi && c.label && byHemi !== c.label) {
      throw new Fail(
        `Hemisphere letter ${c.hemi} is for ${byHemi === "lat" ? "latitude" : "longitude"} but is labelled ${c.label === "lat" ? "latitude" : "longitude"}`,
        "wrong_axis",
      );
    }
    return byHemi ?? c.label ?? (k === 0 ? "lat" : "lon");
  });
  if (axes[0] === axes[1]) {
    if (comps[0]!.hemi && comps[1]!.hemi) {
      throw new Fail(
        axes[0] === "lat"
          ? "Both values have latitude letters (N/S): the longitude needs E or W"
          : "Both values have longitude letters (E/W): the latitude needs N or S",
        "wrong_axis",
      );
    }
    throw new Fail(`Both values are labelled ${axes[0] === "lat" ? "latitude" : "longitude"}`, "wrong_axis");
  }

  const out: Record<Axis, number> = { lat: NaN, lon: NaN };
  comps.forEach((c, k) => {
    const axis = axes[k]!;
    const which = axis === "lat" ? "latitude" : "longitude";
    const f = readFields(c, which);
    if (c.hemi && f.neg) {
      throw new Fail(`Use either a minus sign or a hemisphere letter, not both (${which})`, "sign_and_hemisphere");
    }
    const { abs } = valueOf(f, which);
    const negative = c.hemi ? c.hemi === "S" || c.hemi === "W" : f.neg;
    out[axis] = negative ? -abs : abs;
  });

  if (Math.abs(out.lat) > 90) {
    throw new Fail(`Latitude ${trimNum(Math.abs(out.lat))}° is beyond 90°`, "latitude_out_of_range");
  }
  if (Math.abs(out.lon) > 180) {
    throw new Fail(`Longitude ${trimNum(Math.abs(out.lon))}° is beyond 180°`, "longitude_out_of_range");
  }
  // Normalise -0 to 0 so formatting and JSON stay tidy.
  return [out.lat + 0, out.lon + 0];
}

function trimNum(v: number): string {
  return String(Math.round(v * 1e6) / 1e6);
}

// ---------------------------------------------------------------------------------------------
// Projected pairs

export type ProjectedParseResult =
  | { ok: true; easting: number; northing: number }
  | { ok: false; error: string; code: "empty" | "invalid_character" | "incomplete" | "ambiguous" | "too_long" };

/**
 * Parse "easting northing" in metres: `651409.903 313177.270`, `651409.903, 313177.270`,
 * `E 651409.903 N 313177.270`, `651409.903E 313177.270N` (an optional `m` after each number).
 * Easting first unless letters say otherwise.
 */
export function parseProjectedPair(text: string): ProjectedParseResult {
  if (typeof text !== "string" || text.trim() === "") return { ok: false, error: "Enter an easting and a northing", code: "empty" };
  if (text.length > MAX_POSITION_TEXT_LENGTH) return { ok: false, error: "This text is too long", code: "too_long" };
  type PTok = { t: "num"; v: number } | { t: "letter"; v: "E" | "N" };
  const toks: PTok[] = [];
  const re = /\s+|[,;/]|([EN])(?![A-Za-z])|(m)(?![A-Za-z])|([+\-−]?(?:\d+(?:\.\d*)?|\.\d+))/iy;
  const src = text.trim();
  let at = 0;
  while (at < src.length) {
    re.lastIndex = at;
    const m = re.exec(src);
    if (!m) {
      return { ok: false, error: `Unexpected text "${src.slice(at, at + 12)}": give an easting and a northing in metres`, code: "invalid_character" };
    }
    at = re.lastIndex;
    if (m[1]) toks.push({ t: "letter", v: m[1].toUpperCase() as "E" | "N" });
    else if (m[3]) toks.push({ t: "num", v: Number(m[3].replace("−", "-")) });
  }
  const nums = toks.filter((t): t is { t: "num"; v: number } => t.t === "num");
  const letters = toks.filter((t): t is { t: "letter"; v: "E" | "N" } => t.t === "letter");
  if (nums.length < 2) return { ok: false, error: "Give both an easting and a northing", code: "incomplete" };
  if (nums.length > 2) return { ok: false, error: "Give exactly two numbers: easting and northing", code: "ambiguous" };
  let e = nums[0]!.v;
  let n = nums[1]!.v;
  if (letters.length === 1) return { ok: false, error: "Mark both numbers with E/N, or neither", code: "incomplete" };
  if (letters.length > 2) return { ok: false, error: "Too many E/N letters", code: "ambiguous" };
  if (letters.length === 2) {
    if (letters[0]!.v === letters[1]!.v) return { ok: false, error: `Both numbers are marked ${letters[0]!.v}`, code: "ambiguous" };
    // Prefix (E 651409 N 313177) or suffix (651409E 313177N): the first letter names the first number.
    if (letters[0]!.v === "N") [e, n] = [n, e];
  }
  if (!Number.isFinite(e) || !Number.isFinite(n) || Math.abs(e) > 1e8 || Math.abs(n) > 1e8) {
    return { ok: false, error: "Easting and northing must be metres within ±100,000,000", code: "ambiguous" };
  }
  return { ok: true, easting: e + 0, northing: n + 0 };
}

// ---------------------------------------------------------------------------------------------
// Formatting

export type PositionStyle = "dd" | "ddm" | "dms" | "broadcast";

export interface FormatOptions {
  /** Decimal places: DD degrees (default 5), DDM minutes (default 3), DMS seconds (default 1), broadcast minutes (0–2, default 2). */
  decimals?: number;
  /** "unicode" (° ′ ″, default) or "ascii" (spaces between fields, as typed on a keyboard). */
  marks?: "unicode" | "ascii";
  /** DD only: signed numbers ("50.78533, -1.10750") instead of hemisphere letters. */
  signed?: boolean;
}

const DEFAULT_DECIMALS: Record<PositionStyle, number> = { dd: 5, ddm: 3, dms: 1, broadcast: 2 };

// Upper limits keep the integer arithmetic exact (units stay far below 2^53).
const MAX_DECIMALS: Record<PositionStyle, number> = { dd: 8, ddm: 6, dms: 4, broadcast: 2 };

function checkDecimals(style: PositionStyle, d: number): number {
  const max = MAX_DECIMALS[style];
  if (!Number.isInteger(d) || d < 0 || d > max) {
    throw new RangeError(
      style === "broadcast"
        ? "Broadcast positions use 0 to 2 decimals of a minute (MSC.1/Circ.1310 §5.5: at most 0.01′)"
        : `decimals must be a whole number from 0 to ${max}`,
    );
  }
  return d;
}

function pad(n: number, width: number): string {
  return String(n).padStart(width, "0");
}

/**
 * Split |value| into whole units at a given number of decimals of the smallest field, rounding
 * once so that carries propagate (59.999′ → next degree).
 */
function splitUnits(absValue: number, perDegree: number, decimals: number): { units: bigint; scale: bigint } {
  const scale = 10 ** decimals;
  // A hair over half a unit so that decimal halves stored as ...4999 in binary round up (6.45′ → 6.5′).
  const units = Math.round(absValue * perDegree * scale + 1e-6);
  return { units: BigInt(units), scale: BigInt(scale) };
}

function formatAxis(value: number, axis: Axis, style: PositionStyle, decimals: number, marks: "unicode" | "ascii"): string {
  const degWidth = axis === "lat" ? 2 : 3;
  const uni = marks === "unicode";
  const abs = Math.abs(value);
  if (style === "dd") {
    const s = abs.toFixed(decimals);
    const zero = Number(s) === 0;
    const hemi = zero ? (axis === "lat" ? "N" : "E") : value < 0 ? (axis === "lat" ? "S" : "W") : axis === "lat" ? "N" : "E";
    return uni ? `${s}°${hemi}` : `${s}${hemi}`;
  }
  const perDegree = style === "dms" ? 3600 : 60;
  const { units, scale } = splitUnits(abs, perDegree, decimals);
  const zero = units === 0n;
  const hemi = zero || value >= 0 ? (axis === "lat" ? "N" : "E") : axis === "lat" ? "S" : "W";
  const unitsPerDegree = BigInt(perDegree) * scale;
  const deg = units / unitsPerDegree;
  let rem = units % unitsPerDegree;
  const frac = (x: bigint, intWidth: number) => {
    const whole = x / scale;
    const part = x % scale;
    return decimals > 0 ? `${pad(Number(whole), intWidth)}.${pad(Number(part), decimals)}` : pad(Number(whole), intWidth);
  };
  const degStr = pad(Number(deg), degWidth);
  if (style === "ddm" || style === "broadcast") {
    const minStr = frac(rem, 2);
    if (style === "broadcast") return `${degStr}-${minStr}${hemi}`;
    return uni ? `${degStr}°${minStr}′${hemi}` : `${degStr} ${minStr}${hemi}`;
  }
  const minUnits = 60n * scale;
  const min = rem / minUnits;
  rem = rem % minUnits;
  const secStr = frac(rem, 2);
  return uni ? `${degStr}°${pad(Number(min), 2)}′${secStr}″${hemi}` : `${degStr} ${pad(Number(min), 2)} ${secStr}${hemi}`;
}

/**
 * Format a position. DDM: `50°47.120′N 001°06.450′W`; DMS: `50°47′07.2″N 001°06′27.0″W`;
 * DD: `50.78533°N 1.10750°W` (or signed `50.78533, -1.10750`); broadcast: `50-47.12N 001-06.45W`
 * (leading zeros, the same precision on both axes, at most 0.01′).
 */
export function formatPosition(lat: number, lon: number, style: PositionStyle = "ddm", options: FormatOptions = {}): string {
  if (!Number.isFinite(lat) || !Number.isFinite(lon) || Math.abs(lat) > 90 || Math.abs(lon) > 180) {
    throw new RangeError("Latitude must be within ±90° and longitude within ±180°");
  }
  const decimals = checkDecimals(style, options.decimals ?? DEFAULT_DECIMALS[style]);
  const marks = options.marks ?? "unicode";
  if (style === "dd") {
    if (options.signed) {
      const f = (v: number) => {
        const s = v.toFixed(decimals);
        return Number(s) === 0 ? Math.abs(0).toFixed(decimals) : s;
      };
      return `${f(lat)}, ${f(lon)}`;
    }
    const la = formatAxis(lat, "lat", "dd", decimals, marks);
    const lo = formatAxis(lon, "lon", "dd", decimals, marks);
    return `${la} ${lo}`;
  }
  return `${formatAxis(lat, "lat", style, decimals, marks)} ${formatAxis(lon, "lon", style, decimals, marks)}`;
}

/** All four styles at their default precision, for API responses and the tools page. */
export function formatAll(lat: number, lon: number): Record<PositionStyle, string> {
  return {
    dd: formatPosition(lat, lon, "dd"),
    ddm: formatPosition(lat, lon, "ddm"),
    dms: formatPosition(lat, lon, "dms"),
    broadcast: formatPosition(lat, lon, "broadcast"),
  };
}

/** Bearing as mariners write it: three figures and T, e.g. `047°T`. */
export function formatBearingTrue(bearingDeg: number): string {
  let b = Math.round(bearingDeg) % 360;
  if (b < 0) b += 360;
  return `${pad(b, 3)}°T`;
}
