// Public position tools: convert a position between formats and CRSs, measure between two
// positions, and try a displacement assessment. With JavaScript, results follow the typing
// (debounced requests to the JSON API); without it, the form is a GET and the loader computes
// the same results with the same engine (app/lib/geo/api.ts).
import { useEffect, useId, useMemo, useRef, useState, type ReactNode } from "react";
import { Form } from "react-router";
import type { Route } from "./+types/tools";
import { Caution } from "~/components/Caution";
import { AssessmentFigures } from "~/components/reports/AssessmentSummary";
import type { AssessmentResponse } from "~/lib/geo/assessment";
import { assessBody, convertFromQuery, measureFromQuery, type ApiResult, type ConvertResponse, type MeasureResponse } from "~/lib/geo/api";
import { getDatum, listCrs, parseCrsCode } from "~/lib/geo/crs-registry";
import { assessmentInputSchema, convertQuerySchema, type FieldError, firstFieldError, measureQuerySchema } from "~/lib/geo/schemas";
import type { z } from "zod";

function checkWith(schema: z.ZodType, input: unknown): FieldError | null {
  const r = schema.safeParse(input);
  return r.success ? null : firstFieldError(r.error);
}

export const meta: Route.MetaFunction = () => [
  { title: "Position tools · Tidewire" },
  { name: "description", content: "Convert positions between formats and datums, measure distances and bearings, and check whether a buoy is off station." },
];

// ---------------------------------------------------------------------------------------------
// Form values ↔ API requests (shared by the loader and the browser)

const FIELDS = [
  "position", "from", "to", "fromTf", "toTf",
  "mfrom", "mto",
  "a_charted", "a_crs", "a_tf", "a_swing", "a_chain", "a_depth", "a_method", "a_position", "a_own",
  "a_range", "a_bearing", "a_bearingRef", "a_heading", "a_scale", "a_magnetic", "a_distance", "a_observedAt",
] as const;
type FieldName = (typeof FIELDS)[number];
type Values = Record<FieldName, string>;

const DEFAULTS: Values = {
  position: "", from: "EPSG:4326", to: "EPSG:4230", fromTf: "", toTf: "",
  mfrom: "", mto: "",
  a_charted: "", a_crs: "EPSG:4326", a_tf: "", a_swing: "", a_chain: "", a_depth: "", a_method: "gnss", a_position: "", a_own: "",
  a_range: "", a_bearing: "", a_bearingRef: "true", a_heading: "", a_scale: "", a_magnetic: "", a_distance: "", a_observedAt: "",
};

function valuesFrom(params: URLSearchParams): Values {
  const v = { ...DEFAULTS };
  for (const k of FIELDS) {
    const x = params.get(k);
    if (x !== null) v[k] = x.slice(0, 200);
  }
  return v;
}

function convertQuery(v: Values): Record<string, string> {
  const q: Record<string, string> = { from: v.from, to: v.to, position: v.position };
  if (v.fromTf) q.fromTransformation = v.fromTf;
  if (v.toTf) q.toTransformation = v.toTf;
  return q;
}

function num(s: string): number | undefined {
  return s.trim() === "" ? undefined : Number(s.trim().replace(",", "."));
}

/** "2026-11-20T14:20" (UTC, from a datetime-local input) → ISO 8601 with Z. */
function utcIso(s: string): string | undefined {
  if (s.trim() === "") return undefined;
  return /^\d{4}-\d{2}-\d{2}T\d{2}:\d{2}$/.test(s) ? `${s}:00Z` : s;
}

export function assessmentBody(v: Values): Record<string, unknown> {
  const body: Record<string, unknown> = { charted: { position: v.a_charted, crs: v.a_crs, ...(v.a_tf ? { transformation: v.a_tf } : {}) } };
  if (v.a_swing.trim() !== "") body.swingRadiusM = num(v.a_swing);
  else if (v.a_chain.trim() !== "" || v.a_depth.trim() !== "") body.mooring = { chainLengthM: num(v.a_chain), depthM: num(v.a_depth) };
  const when = utcIso(v.a_observedAt);
  let obs: Record<string, unknown>;
  if (v.a_method === "radar") {
    obs = { method: "radar", ownPosition: v.a_own, rangeNm: num(v.a_range), bearingDeg: num(v.a_bearing), bearingRef: v.a_bearingRef === "relative" ? "relative" : "true", rangeScaleNm: num(v.a_scale) };
    if (v.a_bearingRef === "relative") obs.headingTrueDeg = num(v.a_heading);
  } else if (v.a_method === "compass") {
    obs = { method: "compass", ownPosition: v.a_own, bearingMagneticDeg: num(v.a_magnetic), distanceM: num(v.a_distance) };
  } else {
    obs = { method: "gnss", position: v.a_position };
  }
  if (when) obs.observedAt = when;
  body.observations = [obs];
  return body;
}

/** API error field → the input it belongs to. */
const ASSESS_FIELD: Record<string, FieldName> = {
  "charted.position": "a_charted",
  "charted.crs": "a_crs",
  "charted.transformation": "a_tf",
  swingRadiusM: "a_swing",
  mooring: "a_chain",
  "mooring.chainLengthM": "a_chain",
  "mooring.depthM": "a_depth",
  "observations.0.position": "a_position",
  "observations.0.ownPosition": "a_own",
  "observations.0.rangeNm": "a_range",
  "observations.0.bearingDeg": "a_bearing",
  "observations.0.bearingRef": "a_bearingRef",
  "observations.0.headingTrueDeg": "a_heading",
  "observations.0.rangeScaleNm": "a_scale",
  "observations.0.bearingMagneticDeg": "a_magnetic",
  "observations.0.distanceM": "a_distance",
  "observations.0.observedAt": "a_observedAt",
};
const CONVERT_FIELD: Record<string, FieldName> = { position: "position", from: "from", to: "to", fromTransformation: "fromTf", toTransformation: "toTf" };
const MEASURE_FIELD: Record<string, FieldName> = { from: "mfrom", to: "mto" };

function isProjected(crs: string): boolean {
  const r = parseCrsCode(crs);
  return r.ok && r.crs.kind === "projected";
}

function complete(...xs: string[]): boolean {
  return xs.every((x) => x.trim() !== "");
}
function convertReady(v: Values) {
  return complete(v.position);
}
function measureReady(v: Values) {
  return complete(v.mfrom, v.mto);
}
function assessReady(v: Values) {
  const obs = v.a_method === "radar" ? complete(v.a_own, v.a_range, v.a_bearing, v.a_scale) : v.a_method === "compass" ? complete(v.a_own, v.a_magnetic, v.a_distance, v.a_observedAt) : complete(v.a_position);
  return complete(v.a_charted) && (complete(v.a_swing) || complete(v.a_chain, v.a_depth)) && obs;
}

type Results = {
  convert: ApiResult<ConvertResponse> | null;
  measure: ApiResult<MeasureResponse> | null;
  assess: ApiResult<AssessmentResponse> | null;
};

export function loader({ request }: Route.LoaderArgs) {
  const params = new URL(request.url).searchParams;
  const values = valuesFrom(params);
  const submitted = params.get("tool");
  // Without JavaScript a tool is computed when its button was pressed or its inputs are filled.
  const results: Results = {
    convert: submitted === "convert" || convertReady(values) ? convertFromQuery(convertQuery(values)) : null,
    measure: submitted === "measure" || measureReady(values) ? measureFromQuery({ from: values.mfrom, to: values.mto }) : null,
    assess: submitted === "assess" || assessReady(values) ? assessBody(assessmentBody(values)) : null,
  };
  return { values, results };
}

// ---------------------------------------------------------------------------------------------
// Live updates

/**
 * Runs `run` 300 ms after the inputs (`key`) stop changing. `check` is the API's own zod
 * schema run in the browser first: invalid input is answered here, so only requests the API
 * will accept go over the network.
 */
function useDebouncedApi<T>(
  enabled: boolean,
  key: string,
  check: () => FieldError | null,
  run: (signal: AbortSignal) => Promise<ApiResult<T>>,
  initial: ApiResult<T> | null,
) {
  const [state, setState] = useState<{ result: ApiResult<T> | null; busy: boolean }>({ result: initial, busy: false });
  const first = useRef(true);
  useEffect(() => {
    if (first.current) {
      first.current = false; // the server already computed the first answer
      return;
    }
    if (!enabled) {
      setState({ result: null, busy: false });
      return;
    }
    const ctrl = new AbortController();
    const t = setTimeout(() => {
      const invalid = check();
      if (invalid) {
        setState({ result: { ok: false, ...invalid }, busy: false });
        return;
      }
      setState((s) => ({ ...s, busy: true }));
      run(ctrl.signal)
        .then((result) => setState({ result, busy: false }))
        .catch((e) => {
          if ((e as Error).name !== "AbortError") setState({ result: { ok: false, error: "The service is not reachable just now; press the button to try again.", field: "" }, busy: false });
        });
    }, 300);
    return () => {
      clearTimeout(t);
      ctrl.abort();
    };
    // `key` carries the inputs; `run` is rebuilt every render.
    // eslint-disable-next-line react-hooks/exhaustive-deps
  }, [key, enabled]);
  return state;
}

async function asResult<T>(res: Response): Promise<ApiResult<T>> {
  const body = await res.json().catch(() => null);
  if (res.ok) return { ok: true, value: body as T };
  return { ok: false, error: body?.error ?? `Request failed (${res.status})`, field: body?.field ?? "" };
}

// ---------------------------------------------------------------------------------------------
// Page

export default function Tools({ loaderData }: Route.ComponentProps) {
  const [v, setV] = useState<Values>(loaderData.values);
  const [hydrated, setHydrated] = useState(false);
  useEffect(() => setHydrated(true), []);
  // A CRS change resets its transformation choice (the old one may not apply to the new datum).
  const TF_OF: Partial<Record<FieldName, FieldName>> = { from: "fromTf", to: "toTf", a_crs: "a_tf" };
  const set = (k: FieldName) => (e: { target: { value: string } }) =>
    setV((old) => {
      const next = { ...old, [k]: e.target.value };
      const tf = TF_OF[k];
      if (tf) next[tf] = "";
      return next;
    });

  // Keep the address shareable: the current inputs in the query string.
  useEffect(() => {
    if (!hydrated) return;
    const q = new URLSearchParams();
    for (const k of FIELDS) if (v[k] !== DEFAULTS[k]) q.set(k, v[k]);
    const url = `${window.location.pathname}${q.size ? `?${q}` : ""}`;
    window.history.replaceState(window.history.state, "", url);
  }, [v, hydrated]);

  const cq = convertQuery(v);
  const convert = useDebouncedApi<ConvertResponse>(
    convertReady(v),
    JSON.stringify(cq),
    () => checkWith(convertQuerySchema, cq),
    (signal) => fetch(`/api/v1/convert?${new URLSearchParams(cq)}`, { signal }).then((r) => asResult<ConvertResponse>(r)),
    loaderData.results.convert,
  );
  const measure = useDebouncedApi<MeasureResponse>(
    measureReady(v),
    `${v.mfrom}|${v.mto}`,
    () => checkWith(measureQuerySchema, { from: v.mfrom, to: v.mto }),
    (signal) => fetch(`/api/v1/measure?${new URLSearchParams({ from: v.mfrom, to: v.mto })}`, { signal }).then((r) => asResult<MeasureResponse>(r)),
    loaderData.results.measure,
  );
  const body = assessmentBody(v);
  const assess = useDebouncedApi<AssessmentResponse>(
    assessReady(v),
    JSON.stringify(body),
    () => checkWith(assessmentInputSchema, body),
    (signal) =>
      fetch("/api/v1/assessments", { method: "POST", headers: { "Content-Type": "application/json" }, body: JSON.stringify(body), signal }).then((r) =>
        asResult<AssessmentResponse>(r),
      ),
    loaderData.results.assess,
  );

  const errorFor = (map: Record<string, FieldName>, r: ApiResult<unknown> | null) => (k: FieldName) => (r && !r.ok && map[r.field] === k ? r.error : undefined);
  const cErr = errorFor(CONVERT_FIELD, convert.result);
  const mErr = errorFor(MEASURE_FIELD, measure.result);
  const aErr = errorFor(ASSESS_FIELD, assess.result);
  const show = (m: string) => !hydrated || v.a_method === m;

  return (
    <div className="max-w-5xl space-y-6">
      <div>
        <h1 className="text-2xl font-bold">Position tools</h1>
        <p className="mt-2 max-w-3xl text-slate">
          Convert a position between the ways mariners write it and between datums, measure the distance and bearing between two positions on the WGS 84
          ellipsoid, and check whether a buoy is outside its swing circle. The same calculations are available as a{" "}
          <a href="/feeds">JSON API</a>.
        </p>
      </div>
      <Caution />

      <Form method="get" action="/tools" className="space-y-6" noValidate>
        {/* Convert */}
        <section className="card space-y-4" aria-labelledby="convert-h">
          <h2 id="convert-h" className="text-lg font-bold">
            Convert a position
          </h2>
          <FormatHelp />
          <div className="grid gap-4 md:grid-cols-2">
            <TextInput label="Position" name="position" value={v.position} onChange={set("position")} error={cErr("position")} placeholder="55°12.30′N 003°01.10′E" hint={isProjected(v.from) ? "Easting and northing in metres, e.g. 651409.903 313177.270" : undefined} className="md:col-span-2" />
            <CrsSelect label="From" name="from" value={v.from} onChange={set("from")} error={cErr("from")} />
            <CrsSelect label="To" name="to" value={v.to} onChange={set("to")} error={cErr("to")} />
            <TransformationSelect label="Transformation (from)" name="fromTf" crs={v.from} value={v.fromTf} onChange={set("fromTf")} error={cErr("fromTf")} />
            <TransformationSelect label="Transformation (to)" name="toTf" crs={v.to} value={v.toTf} onChange={set("toTf")} error={cErr("toTf")} />
          </div>
          <button type="submit" name="tool" value="convert" className="btn-primary">
            Convert
          </button>
          <ResultRegion busy={convert.busy} testId="convert-result">
            {convert.result ? <ConvertResult r={convert.result} known={new Set(Object.keys(CONVERT_FIELD))} /> : null}
          </ResultRegion>
        </section>

        {/* Measure */}
        <section className="card space-y-4" aria-labelledby="measure-h">
          <h2 id="measure-h" className="text-lg font-bold">
            Measure between two positions
          </h2>
          <p className="text-sm text-slate">Both positions on WGS 84. The distance is the shortest path on the ellipsoid (geodesic); bearings are degrees true.</p>
          <div className="grid gap-4 md:grid-cols-2">
            <TextInput label="From" name="mfrom" value={v.mfrom} onChange={set("mfrom")} error={mErr("mfrom")} placeholder="55°11.70′N 003°00.60′E" />
            <TextInput label="To" name="mto" value={v.mto} onChange={set("mto")} error={mErr("mto")} placeholder="55°12.30′N 003°01.10′E" />
          </div>
          <button type="submit" name="tool" value="measure" className="btn-primary">
            Measure
          </button>
          <ResultRegion busy={measure.busy} testId="measure-result">
            {measure.result ? <MeasureResult r={measure.result} known={new Set(Object.keys(MEASURE_FIELD))} /> : null}
          </ResultRegion>
        </section>

        {/* Assessment */}
        <section className="card space-y-4" aria-labelledby="assess-h">
          <h2 id="assess-h" className="text-lg font-bold">
            Try an assessment: is the buoy off station?
          </h2>
          <p className="text-sm text-slate">
            The aid&apos;s charted position and swing circle against one observation. Verdict: <em>off station</em> when the observed position is outside the swing
            circle by more than the uncertainty, <em>within swing circle</em> when it is inside even allowing for the uncertainty, otherwise{" "}
            <em>inconclusive</em>. Error figures: GNSS 9 m (95%) plus 10 m alongside; radar range the larger of 30 m or 1% of the range scale and bearing 1°
            (IMO MSC.192(79)); hand-bearing compass 2° plus 1° for the magnetic model, estimated distance ±25%.
          </p>
          <fieldset className="grid gap-4 md:grid-cols-3">
            <legend className="field-label">The aid</legend>
            <TextInput label="Charted position" name="a_charted" value={v.a_charted} onChange={set("a_charted")} error={aErr("a_charted")} placeholder="55°11.700′N 003°00.600′E" hint={isProjected(v.a_crs) ? "Easting and northing in metres" : undefined} className="md:col-span-3" />
            <CrsSelect label="Chart datum" name="a_crs" value={v.a_crs} onChange={set("a_crs")} error={aErr("a_crs")} />
            <TransformationSelect label="Transformation" name="a_tf" crs={v.a_crs} value={v.a_tf} onChange={set("a_tf")} error={aErr("a_tf")} />
            <TextInput label="Swing radius (m)" name="a_swing" inputMode="decimal" value={v.a_swing} onChange={set("a_swing")} error={aErr("a_swing")} hint="Or give the mooring:" />
            <TextInput label="Chain length (m)" name="a_chain" inputMode="decimal" value={v.a_chain} onChange={set("a_chain")} error={aErr("a_chain")} />
            <TextInput label="Depth at low water (m)" name="a_depth" inputMode="decimal" value={v.a_depth} onChange={set("a_depth")} error={aErr("a_depth")} hint="Swing radius √(chain² − depth²)" />
          </fieldset>
          <fieldset className="grid gap-4 md:grid-cols-3">
            <legend className="field-label">The observation</legend>
            <SelectInput
              label="Method"
              name="a_method"
              value={v.a_method}
              onChange={set("a_method")}
              options={[
                { value: "gnss", label: "GNSS, alongside the mark" },
                { value: "radar", label: "Radar range and bearing" },
                { value: "compass", label: "Hand-bearing compass and estimated distance" },
              ]}
            />
            <TextInput label="Observed at (UTC)" name="a_observedAt" type="datetime-local" value={v.a_observedAt} onChange={set("a_observedAt")} error={aErr("a_observedAt")} hint="Needed for a compass bearing (magnetic variation)" />
            {show("gnss") ? <TextInput label="GNSS position alongside (WGS 84)" name="a_position" value={v.a_position} onChange={set("a_position")} error={aErr("a_position")} className="md:col-span-3" /> : null}
            {show("radar") || show("compass") ? (
              <TextInput label="Own position (WGS 84, radar or compass)" name="a_own" value={v.a_own} onChange={set("a_own")} error={aErr("a_own")} className="md:col-span-3" />
            ) : null}
            {show("radar") ? (
              <>
                <TextInput label="Radar range (M)" name="a_range" inputMode="decimal" value={v.a_range} onChange={set("a_range")} error={aErr("a_range")} />
                <TextInput label="Radar bearing (°)" name="a_bearing" inputMode="decimal" value={v.a_bearing} onChange={set("a_bearing")} error={aErr("a_bearing")} />
                <SelectInput
                  label="Bearing is"
                  name="a_bearingRef"
                  value={v.a_bearingRef}
                  onChange={set("a_bearingRef")}
                  options={[
                    { value: "true", label: "True" },
                    { value: "relative", label: "Relative to the heading" },
                  ]}
                  error={aErr("a_bearingRef")}
                />
                {!hydrated || v.a_bearingRef === "relative" ? (
                  <TextInput label="Heading (° true, for a relative bearing)" name="a_heading" inputMode="decimal" value={v.a_heading} onChange={set("a_heading")} error={aErr("a_heading")} />
                ) : null}
                <TextInput label="Range scale in use (M)" name="a_scale" inputMode="decimal" value={v.a_scale} onChange={set("a_scale")} error={aErr("a_scale")} />
              </>
            ) : null}
            {show("compass") ? (
              <>
                <TextInput label="Compass bearing (° magnetic)" name="a_magnetic" inputMode="decimal" value={v.a_magnetic} onChange={set("a_magnetic")} error={aErr("a_magnetic")} />
                <TextInput label="Estimated distance (m)" name="a_distance" inputMode="decimal" value={v.a_distance} onChange={set("a_distance")} error={aErr("a_distance")} />
              </>
            ) : null}
          </fieldset>
          <button type="submit" name="tool" value="assess" className="btn-primary">
            Assess
          </button>
          <ResultRegion busy={assess.busy} testId="assess-result">
            {assess.result ? <AssessResult r={assess.result} known={new Set(Object.keys(ASSESS_FIELD))} /> : null}
          </ResultRegion>
        </section>
      </Form>
    </div>
  );
}

// ---------------------------------------------------------------------------------------------
// Pieces

function FormatHelp() {
  return (
    <details className="text-sm text-slate">
      <summary className="cursor-pointer font-semibold text-ink">Accepted formats</summary>
      <ul className="mt-2 list-disc space-y-1 pl-6">
        <li>
          Degrees and decimal minutes: <code className="position">55°12.30′N 003°01.10′E</code>, <code className="position">55 12.30N 3 1.10E</code>
        </li>
        <li>
          Broadcast form: <code className="position">55-12.30N 003-01.10E</code>
        </li>
        <li>
          Degrees, minutes, seconds: <code className="position">55°12′18″N 3°01′06″E</code> (ASCII <code>&apos;</code> and <code>&quot;</code> work too)
        </li>
        <li>
          Decimal degrees: <code className="position">55.205, 3.01833</code> or <code className="position">55.205N 3.01833E</code>
        </li>
        <li>Latitude first, unless letters or labels say otherwise (<code className="position">lon 3.018 lat 55.205</code>).</li>
        <li>
          Projected CRSs (UTM, British National Grid, Irish Grid): <code className="position">easting northing</code> in metres.
        </li>
      </ul>
    </details>
  );
}

function ResultRegion({ busy, testId, children }: { busy: boolean; testId: string; children: ReactNode }) {
  return (
    <div aria-live="polite" data-testid={testId} data-busy={busy ? "true" : undefined} className="min-h-6">
      {busy && !children ? <p className="text-sm text-slate">Working it out…</p> : children}
    </div>
  );
}

function ErrorLine({ error }: { error: string }) {
  return (
    <p className="text-sm font-semibold text-danger" role="alert">
      {error}
    </p>
  );
}

function FieldNote({ r, known }: { r: FieldError; known: Set<string> }) {
  // Errors for a known field are shown beside it; anything else here.
  return known.has(r.field) ? <p className="text-sm text-slate">Please correct the field marked above.</p> : <ErrorLine error={r.error} />;
}

function ConvertResult({ r, known }: { r: ApiResult<ConvertResponse>; known: Set<string> }) {
  if (!r.ok) return <FieldNote r={r} known={known} />;
  const f = r.value.formatted;
  return (
    <div className="space-y-2">
      <dl className="grid grid-cols-[auto_1fr] gap-x-4 gap-y-1 text-sm">
        {"grid" in f ? (
          <>
            <dt className="text-slate">Easting, northing</dt>
            <dd className="position" data-testid="convert-grid">
              {f.grid}
            </dd>
          </>
        ) : (
          <>
            <dt className="text-slate">Degrees, minutes</dt>
            <dd className="position" data-testid="convert-ddm">
              {f.ddm}
            </dd>
            <dt className="text-slate">Broadcast</dt>
            <dd className="position">{f.broadcast}</dd>
            <dt className="text-slate">Degrees, minutes, seconds</dt>
            <dd className="position">{f.dms}</dd>
            <dt className="text-slate">Decimal degrees</dt>
            <dd className="position">{f.dd}</dd>
          </>
        )}
      </dl>
      <p className="text-xs text-slate">
        {r.value.from} → {r.value.to}
        {r.value.transformations.length
          ? ` via ${r.value.transformations.map((t) => `${t.name} (${t.id}, ±${t.accuracyM} m)`).join(" and ")}; combined accuracy about ${r.value.accuracyM.toFixed(1)} m.`
          : "; no datum shift."}
      </p>
    </div>
  );
}

function MeasureResult({ r, known }: { r: ApiResult<MeasureResponse>; known: Set<string> }) {
  if (!r.ok) return <FieldNote r={r} known={known} />;
  const m = r.value;
  const brg = (x: number) => `${x.toFixed(1).padStart(5, "0")}°T`;
  return (
    <dl className="grid grid-cols-[auto_1fr] gap-x-4 gap-y-1 text-sm">
      <dt className="text-slate">Distance</dt>
      <dd data-testid="measure-distance">
        {m.distanceNm.toFixed(3)} M · {m.distanceCables.toFixed(1)} cables · {m.distanceM.toFixed(1)} m
      </dd>
      <dt className="text-slate">Initial bearing</dt>
      <dd data-testid="measure-bearing">{brg(m.initialBearingTrueDeg)}</dd>
      <dt className="text-slate">Final bearing</dt>
      <dd>{brg(m.finalBearingTrueDeg)}</dd>
    </dl>
  );
}

function AssessResult({ r, known }: { r: ApiResult<AssessmentResponse>; known: Set<string> }) {
  if (!r.ok) return <FieldNote r={r} known={known} />;
  const o = r.value.observations[0];
  return (
    <div>
      <AssessmentFigures result={r.value} />
      {o ? (
        <p className="mt-2 text-xs text-slate">
          Observation uncertainty (95%): {o.uncertaintyM.toFixed(1)} m
          {o.declinationDeg !== undefined ? `; magnetic variation ${Math.abs(o.declinationDeg).toFixed(1)}° ${o.declinationDeg >= 0 ? "E" : "W"} (World Magnetic Model)` : ""}.
        </p>
      ) : null}
    </div>
  );
}

type InputProps = {
  label: string;
  name: FieldName;
  value: string;
  onChange: (e: { target: { value: string } }) => void;
  error?: string;
  hint?: string;
  className?: string;
  placeholder?: string;
  type?: string;
  inputMode?: "decimal" | "text";
};

function TextInput({ label, name, value, onChange, error, hint, className, placeholder, type = "text", inputMode }: InputProps) {
  const id = useId();
  return (
    <div className={className}>
      <label htmlFor={id} className="field-label">
        {label}
      </label>
      <input
        id={id}
        name={name}
        type={type}
        inputMode={inputMode}
        value={value}
        onChange={onChange}
        placeholder={placeholder}
        autoComplete="off"
        spellCheck={false}
        className="field-input"
        aria-invalid={error ? true : undefined}
        aria-describedby={[error ? `${id}-e` : "", hint ? `${id}-h` : ""].filter(Boolean).join(" ") || undefined}
      />
      {hint ? (
        <p id={`${id}-h`} className="field-hint">
          {hint}
        </p>
      ) : null}
      {error ? (
        <p id={`${id}-e`} className="field-error" role="alert">
          {error}
        </p>
      ) : null}
    </div>
  );
}

function SelectInput({ label, name, value, onChange, options, error }: Omit<InputProps, "placeholder"> & { options: { value: string; label: string }[] }) {
  const id = useId();
  return (
    <div>
      <label htmlFor={id} className="field-label">
        {label}
      </label>
      <select id={id} name={name} value={value} onChange={onChange} className="field-input" aria-invalid={error ? true : undefined} aria-describedby={error ? `${id}-e` : undefined}>
        {options.map((o) => (
          <option key={o.value} value={o.value}>
            {o.label}
          </option>
        ))}
      </select>
      {error ? (
        <p id={`${id}-e`} className="field-error" role="alert">
          {error}
        </p>
      ) : null}
    </div>
  );
}

const GROUP_LABELS = { geographic: "Latitude and longitude", "national grid": "National grids", UTM: "UTM zones" } as const;

function CrsSelect({ label, name, value, onChange, error }: Omit<InputProps, "placeholder">) {
  const id = useId();
  const groups = useMemo(() => {
    const all = listCrs();
    return (Object.keys(GROUP_LABELS) as (keyof typeof GROUP_LABELS)[]).map((g) => ({ g, items: all.filter((c) => c.group === g) }));
  }, []);
  return (
    <div>
      <label htmlFor={id} className="field-label">
        {label}
      </label>
      <select id={id} name={name} value={value} onChange={onChange} className="field-input" aria-invalid={error ? true : undefined} aria-describedby={error ? `${id}-e` : undefined}>
        {groups.map(({ g, items }) => (
          <optgroup key={g} label={GROUP_LABELS[g]}>
            {items.map((c) => (
              <option key={c.id} value={c.id}>
                {c.label} ({c.id})
              </option>
            ))}
          </optgroup>
        ))}
      </select>
      {error ? (
        <p id={`${id}-e`} className="field-error" role="alert">
          {error}
        </p>
      ) : null}
    </div>
  );
}

function TransformationSelect({ label, name, crs, value, onChange, error }: Omit<InputProps, "placeholder"> & { crs: string }) {
  const id = useId();
  const parsed = parseCrsCode(crs);
  const datum = parsed.ok ? getDatum(parsed.crs.datum) : null;
  const options = datum
    ? datum.transformations.map((t) => ({
        value: t.id === datum.defaultTransformation ? "" : t.id,
        label: t.id === "identity" ? "None (WGS 84)" : `${t.name}, ${t.id.startsWith("EPSG:") ? `${t.id}, ` : ""}±${t.accuracyM} m — ${t.area}${t.id === datum.defaultTransformation ? " (default)" : ""}`,
      }))
    : [{ value: "", label: "Default" }];
  return (
    <div>
      <label htmlFor={id} className="field-label">
        {label}
      </label>
      <select id={id} name={name} value={value} onChange={onChange} className="field-input" disabled={options.length < 2} aria-invalid={error ? true : undefined} aria-describedby={error ? `${id}-e` : undefined}>
        {options.map((o) => (
          <option key={o.value} value={o.value}>
            {o.label}
          </option>
        ))}
      </select>
      {error ? (
        <p id={`${id}-e`} className="field-error" role="alert">
          {error}
        </p>
      ) : null}
    </div>
  );
}
