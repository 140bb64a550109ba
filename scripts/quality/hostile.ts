// fast-check arbitraries for hostile input: wrong types, huge strings, Unicode edge cases, SQL
// and HTML fragments, out-of-range and non-finite numbers, and mutations of a valid JSON body.
import fc from "fast-check";

export const SQL = ["' OR '1'='1", "'; DROP TABLE users; --", "\" OR 1=1 -- ", "1; SELECT SLEEP(5)", "%", "_", "\\", "\\'", "' UNION SELECT password_hash FROM users --", "`", "0x27"];
export const HTML = ["<script>alert(1)</script>", "\"><img src=x onerror=alert(1)>", "<svg/onload=alert(1)>", "javascript:alert(1)", "</textarea><script>1</script>", "{{7*7}}", "${7*7}", "<!--", "&lt;b&gt;", "<b>bold</b>"];
export const UNICODE = [
  "\u0000",
  "a\u0000b",
  "\uFEFF",
  "\u202Eevil",
  "\uD800",
  "\uDFFF",
  "e\u0301\u0301\u0301",
  "👩‍👩‍👧‍👦",
  "🏳️‍🌈",
  "\u200B",
  "ǅ",
  "İ",
  "ß",
  "ﬀ",
  "\r\n\r\n",
  "\t",
  " ",
  "　",
  "٣٤٥",
  "𝟙𝟚",
  "\u0085",
  "\u2028",
  "Ｓｋｅｒｒｏｗ",
];
export const NUMBERISH = ["NaN", "Infinity", "-Infinity", "-0", "1e309", "-1e309", "1e-400", "0x1F", "1_000", "9".repeat(400), "-1", "3.4.5", "١٢٣", "1,5", " 12 ", "+", "-", "."];

/** Strings with a habit of breaking things. */
export const hostileString: fc.Arbitrary<string> = fc.oneof(
  { arbitrary: fc.constantFrom(...SQL, ...HTML, ...UNICODE, ...NUMBERISH, ""), weight: 4 },
  { arbitrary: fc.string({ unit: "binary", maxLength: 40 }), weight: 2 },
  { arbitrary: fc.string({ unit: "grapheme", maxLength: 40 }), weight: 2 },
  { arbitrary: fc.string({ maxLength: 20 }).map((s) => s + SQL[0]), weight: 1 },
  // Huge: past every column width and most limits (the server caps bodies far above this).
  { arbitrary: fc.constantFrom(10_000, 70_000, 300_000).map((n) => "A".repeat(n)), weight: 1 },
  { arbitrary: fc.constantFrom(...UNICODE).map((u) => u.repeat(5000)), weight: 1 },
  { arbitrary: fc.double().map(String), weight: 1 },
  { arbitrary: fc.integer().map(String), weight: 1 },
);

/** Any JSON value, with numbers at the edges and the strings above. */
export const hostileJson: fc.Arbitrary<unknown> = fc.letrec((tie) => ({
  value: fc.oneof(
    { depthSize: "small" },
    hostileString,
    fc.double({ noNaN: true }),
    fc.constantFrom(0, -1, 1e308, -1e308, Number.MAX_SAFE_INTEGER + 2, 2 ** 31, -(2 ** 31) - 1, 360.0001, -90.0001, 180.0001, 1e-320),
    fc.boolean(),
    fc.constant(null),
    fc.array(tie("value"), { maxLength: 4 }),
    fc.dictionary(fc.oneof(hostileString, fc.constantFrom("__proto__", "constructor", "prototype")), tie("value"), { maxKeys: 4 }),
  ),
})).value;

type Json = null | boolean | number | string | Json[] | { [k: string]: Json };

/** Paths to every value in a JSON tree. */
function paths(v: Json, at: (string | number)[] = []): (string | number)[][] {
  const here = [at];
  if (Array.isArray(v)) return here.concat(...v.map((x, i) => paths(x, [...at, i])));
  if (v && typeof v === "object") return here.concat(...Object.entries(v).map(([k, x]) => paths(x, [...at, k])));
  return here;
}

function setAt(root: Json, path: (string | number)[], value: Json | undefined): Json {
  if (path.length === 0) return (value ?? null) as Json;
  const copy = structuredClone(root) as Record<string | number, Json>;
  let node = copy as Record<string | number, Json>;
  for (const p of path.slice(0, -1)) node = node[p] as Record<string | number, Json>;
  const last = path[path.length - 1];
  if (value === undefined) {
    if (Array.isArray(node)) node.splice(Number(last), 1);
    else delete node[last];
  } else node[last] = value;
  return copy as Json;
}

/**
 * A valid body with one to three of its values replaced (by hostile values or wrong types),
 * removed, or joined by an unexpected key: near-valid input reaches deeper than noise.
 */
export function mutationsOf(valid: Json): fc.Arbitrary<unknown> {
  const all = paths(valid);
  const one = fc.tuple(fc.constantFrom(...all), fc.oneof(hostileJson.map((v) => ({ op: "set" as const, v })), fc.constant({ op: "delete" as const, v: undefined }), hostileString.map((k) => ({ op: "add" as const, v: k })))).map(
    ([path, m]) =>
      (doc: Json): Json => {
        if (m.op === "set") return setAt(doc, path, m.v as Json);
        if (m.op === "delete") return path.length ? setAt(doc, path, undefined) : doc;
        const target = path.length ? path : [];
        return setAt(doc, [...target.slice(0, -1), `x${String(m.v).slice(0, 20)}`], 1);
      },
  );
  return fc.array(one, { minLength: 1, maxLength: 3 }).map((ops) => {
    let doc = structuredClone(valid);
    for (const op of ops) {
      try {
        doc = op(doc);
      } catch {
        /* the path vanished after an earlier deletion */
      }
    }
    return doc;
  });
}

/** Number of runs per property: short by default; FUZZ_RUNS=500 for a long run. */
export const RUNS = Number(process.env.FUZZ_RUNS ?? 12);

/**
 * fc.assert with a readable failure: fast-check's report repeats the (possibly 300 kB)
 * counterexample; keep the first few kB of it.
 */
export async function check<Ts extends unknown[]>(property: fc.IAsyncPropertyWithHooks<Ts>, params: fc.Parameters<Ts> = {}): Promise<void> {
  try {
    await fc.assert(property, { numRuns: RUNS, endOnFailure: true, ...params });
  } catch (e) {
    const err = e as Error & { cause?: unknown };
    const cause = err.cause instanceof Error ? `\n${err.cause.message}` : "";
    throw new Error(`${err.message.slice(0, 1500)}…${cause.slice(0, 2500)}`);
  }
}
