/**
 * Light characteristics as written on charts: `Fl(2) R 10s`, `Q(6)+LFl 15s`, `VQ(3) 5s`,
 * `Iso W 4s`, `Oc G 6s`, `Mo(A) 8s`, `Fl(2+1) G 10s`, `LFl 10s`, `Al.Bu.Y 3s`, `F R` …
 *
 * Notation: common chart notation (abbreviations as on charts, summarised in
 * ../shared/TRADE.md "IALA Maritime Buoyage System"). A light without a colour letter is white
 * (common chart practice). Pure: no I/O.
 *
 * Grammar accepted (spaces between parts optional where unambiguous):
 *   characteristic := ["Al."] phase ["+" phase] [colours] [period]
 *   phase          := rhythm [ "(" group ")" ]
 *   rhythm         := F | Fl | LFl | Q | VQ | UQ | IQ | IVQ | IUQ | Iso | Oc | Mo | FFl
 *   group          := n | n+m[+k]          (Mo takes a letter or digit instead: Mo(A))
 *   colours        := colour ("." colour)* | colour+      (W R G Y Bu, e.g. WRG for sectors)
 *   period         := number "s"
 */

export const RHYTHMS = {
  F: "Fixed",
  Fl: "Flashing",
  LFl: "Long-flashing",
  Q: "Quick",
  VQ: "Very quick",
  UQ: "Ultra quick",
  IQ: "Interrupted quick",
  IVQ: "Interrupted very quick",
  IUQ: "Interrupted ultra quick",
  Iso: "Isophase",
  Oc: "Occulting",
  Mo: "Morse code",
  FFl: "Fixed and flashing",
} as const;
export type Rhythm = keyof typeof RHYTHMS;

export const COLOURS = { W: "white", R: "red", G: "green", Y: "yellow", Bu: "blue" } as const;
export type Colour = keyof typeof COLOURS;

export interface LightPhase {
  rhythm: Rhythm;
  /** Flash groups, e.g. [2] for Fl(2), [2, 1] for Fl(2+1); null when not grouped. */
  group: number[] | null;
  /** Morse letter(s) for Mo(…). */
  morse?: string;
}

export interface LightCharacteristic {
  /** Normalised chart text, e.g. `Fl(2) R 10s`. */
  text: string;
  /** The main rhythm (the first phase). */
  rhythm: Rhythm;
  rhythmLabel: string;
  group: number[] | null;
  morse?: string;
  /** Second phase of a composite light, e.g. LFl in `Q(6)+LFl 15s`. */
  composite?: LightPhase;
  /** `Al.` — colours alternate. */
  alternating: boolean;
  colours: Colour[];
  /** Period in seconds; null for a fixed light or a continuous quick light. */
  periodS: number | null;
  /** Plain-English description, e.g. "Flashing group of 2, red, every 10 s". */
  description: string;
}

export type LightParseResult = { ok: true; value: LightCharacteristic } | { ok: false; error: string };

const RHYTHM_NAMES = Object.keys(RHYTHMS) as Rhythm[];
// Longest names first so "LFl" is not read as "L" + "Fl", nor "IVQ" as "IV" …
const RHYTHM_ORDER = [...RHYTHM_NAMES].sort((a, b) => b.length - a.length);
const COLOUR_ORDER: Colour[] = ["Bu", "W", "R", "G", "Y"];
export const MAX_LIGHT_TEXT_LENGTH = 60;
const MAX_PERIOD_S = 120;
const QUICK: Rhythm[] = ["Q", "VQ", "UQ", "IQ", "IVQ", "IUQ"];

const RHYTHM_HINT = "Start with the rhythm: F, Fl, LFl, Q, VQ, UQ, Iso, Oc, Mo(…) (e.g. Fl(2) R 10s)";

function readRhythm(s: string, at: number): { rhythm: Rhythm; end: number } | null {
  for (const r of RHYTHM_ORDER) {
    if (s.startsWith(r, at)) {
      const next = s[at + r.length];
      // "Fl" must not be the start of another word, e.g. "Flash".
      if (next && /[a-z]/.test(next)) continue;
      return { rhythm: r, end: at + r.length };
    }
  }
  return null;
}

function describePhase(p: LightPhase): string {
  let d: string = RHYTHMS[p.rhythm];
  if (p.morse) d += ` (letter ${p.morse})`;
  else if (p.group) d += p.group.length > 1 ? ` group of ${p.group.join(" + ")}` : ` group of ${p.group[0]}`;
  return d;
}

function formatPhase(p: LightPhase): string {
  if (p.morse) return `${p.rhythm}(${p.morse})`;
  return p.group ? `${p.rhythm}(${p.group.join("+")})` : p.rhythm;
}

/** Parses a light characteristic; every rejection says what was wrong and how to write it. */
export function parseLightCharacteristic(input: string): LightParseResult {
  const raw = input.trim().replace(/\s+/g, " ");
  if (!raw) return { ok: false, error: `Enter the light characteristic as on the chart, e.g. Fl(2) R 10s` };
  if (raw.length > MAX_LIGHT_TEXT_LENGTH) return { ok: false, error: `A light characteristic has at most ${MAX_LIGHT_TEXT_LENGTH} characters` };
  const s = raw;
  let i = 0;
  const skipSpace = () => {
    while (s[i] === " ") i++;
  };

  let alternating = false;
  if (s.startsWith("Al.", i) || s.startsWith("Al ", i)) {
    alternating = true;
    i += 3;
    skipSpace();
  }

  const phases: LightPhase[] = [];
  let impliedRhythm = false; // "Al.Bu.Y 3s": alternating flashes written by their colours only
  for (;;) {
    const r = readRhythm(s, i);
    if (!r) {
      const word = s.slice(i).split(/[ (+.]/)[0] || s.slice(i, i + 1);
      if (phases.length === 0) {
        // Alternating lights may start straight with colours: "Al.WR 4s" (rhythm taken as fixed is ambiguous).
        if (alternating && COLOUR_ORDER.some((c) => s.startsWith(c, i))) {
          phases.push({ rhythm: "Fl", group: null });
          impliedRhythm = true;
          break;
        }
        return { ok: false, error: `"${word}" is not a light rhythm. ${RHYTHM_HINT}` };
      }
      return { ok: false, error: `"${word}" after "+" is not a light rhythm. A composite light is written like Q(6)+LFl 15s` };
    }
    i = r.end;
    const phase: LightPhase = { rhythm: r.rhythm, group: null };
    if (s[i] === "(") {
      const close = s.indexOf(")", i);
      if (close < 0) return { ok: false, error: `The group after ${r.rhythm} is missing its closing bracket, e.g. ${r.rhythm}(2)` };
      const inner = s.slice(i + 1, close).trim();
      i = close + 1;
      if (r.rhythm === "Mo") {
        if (!/^[A-Z0-9]{1,2}$/.test(inner)) return { ok: false, error: `Morse lights take a letter or digit in brackets, e.g. Mo(A) 8s (got "${inner}")` };
        phase.morse = inner;
      } else {
        if (r.rhythm === "F") return { ok: false, error: "A fixed light (F) has no flash group" };
        if (!/^\d{1,2}(\+\d{1,2}){0,2}$/.test(inner)) {
          return { ok: false, error: `The group "${inner}" must be a number of flashes like (2) or a composite group like (2+1)` };
        }
        const group = inner.split("+").map(Number);
        if (group.some((n) => n < 1 || n > 12)) return { ok: false, error: `A flash group must count 1 to 12 flashes (got "${inner}")` };
        phase.group = group;
      }
    } else if (r.rhythm === "Mo") {
      return { ok: false, error: "A Morse light needs its letter in brackets, e.g. Mo(A) 8s" };
    }
    phases.push(phase);
    if (s[i] === "+" && /[A-Z]/.test(s[i + 1] ?? "")) {
      i++;
      if (phases.length >= 2) return { ok: false, error: "At most two phases can be combined with +, e.g. Q(6)+LFl 15s" };
      continue;
    }
    break;
  }

  skipSpace();
  if (s[i] === ".") i++;
  // Colours
  const colours: Colour[] = [];
  for (;;) {
    const c = COLOUR_ORDER.find((col) => s.startsWith(col, i));
    if (!c) break;
    const after = s[i + c.length];
    if (after && /[a-z]/.test(after)) break; // a word, not a colour
    colours.push(c);
    i += c.length;
    if (s[i] === ".") {
      i++;
      continue;
    }
  }
  skipSpace();

  // Period
  let periodS: number | null = null;
  const rest = s.slice(i);
  if (rest) {
    const m = /^(\d{1,3}(?:\.\d{1,2})?) ?s$/.exec(rest);
    if (!m) {
      const colourLike = /^[A-Z][a-z]?/.exec(rest)?.[0];
      if (colourLike && !/^\d/.test(rest)) {
        return { ok: false, error: `"${rest.split(" ")[0]}" is not a light colour: use W, R, G, Y or Bu (e.g. Fl(2) R 10s)` };
      }
      if (/^\d/.test(rest)) return { ok: false, error: `The period "${rest}" must be a number of seconds followed by s, e.g. 10s` };
      return { ok: false, error: `Cannot read "${rest}": after the rhythm come the colour letters and the period, e.g. Fl(2) R 10s` };
    }
    periodS = Number(m[1]);
    if (!(periodS > 0) || periodS > MAX_PERIOD_S) return { ok: false, error: `The period must be more than 0 and at most ${MAX_PERIOD_S} s (got ${m[1]} s)` };
  }

  const main = phases[0]!;
  const composite = phases[1];
  if (main.rhythm === "F" && !composite) {
    if (periodS !== null) return { ok: false, error: "A fixed light (F) shows continuously and has no period: write e.g. F R" };
  } else if (periodS === null) {
    const continuousQuick = QUICK.includes(main.rhythm) && !main.group && !composite && !main.rhythm.startsWith("I");
    if (!continuousQuick) {
      return { ok: false, error: `${formatPhase(main)}${composite ? "+" + formatPhase(composite) : ""} needs a period in seconds, e.g. ${formatPhase(main)}${composite ? "+" + formatPhase(composite) : ""} ${colours.length ? colours.join(alternating ? "." : "") + " " : ""}10s` };
    }
  }
  if (alternating && colours.length < 2) return { ok: false, error: "An alternating light (Al.) needs at least two colours, e.g. Al.WR 4s or Al.Bu.Y 3s" };
  if (new Set(colours).size !== colours.length) return { ok: false, error: "A colour is repeated" };

  const shown: Colour[] = colours.length ? colours : ["W"];
  const phaseText = `${formatPhase(main)}${composite ? "+" + formatPhase(composite) : ""}`;
  const period = periodS !== null ? `${periodS}s` : "";
  const text = alternating
    ? [impliedRhythm ? `Al.${colours.join(".")}` : `Al.${phaseText} ${colours.join(".")}`, period].filter(Boolean).join(" ")
    : [phaseText, colours.join(""), period].filter(Boolean).join(" ");
  const description = [
    `${alternating ? "Alternating " : ""}${describePhase(main)}${composite ? " followed by " + describePhase(composite).toLowerCase() : ""}`.replace(/^Alternating (\w)/, (_, c: string) => `Alternating ${c.toLowerCase()}`),
    shown.map((c) => COLOURS[c]).join(alternating ? " and " : ", "),
    periodS !== null ? `every ${periodS} s` : main.rhythm === "F" ? "continuous" : "continuous",
  ].join(", ");

  const value: LightCharacteristic = {
    text,
    rhythm: main.rhythm,
    rhythmLabel: RHYTHMS[main.rhythm],
    group: main.group,
    alternating,
    colours: shown,
    periodS,
    description,
  };
  if (main.morse) value.morse = main.morse;
  if (composite) value.composite = composite;
  return { ok: true, value };
}
