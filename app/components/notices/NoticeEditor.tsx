// The staff notice editor. Works without JavaScript (a plain form checked on the server); with
// JavaScript, each position line is parsed as you type (the geo engine is pure and runs in the
// browser) and the map and the text stay in sync: drawing fills the positions, typing redraws.
import { useMemo, useState } from "react";
import { Form, useNavigation } from "react-router";
import { Field, FormError, Select, TextArea } from "~/components/forms";
import { MapView, type Basemap, type DrawMode, type DrawnShape, type MapFeature } from "~/components/map/MapView";
import { fromWgs84, isGeographicCoord } from "~/lib/geo/crs";
import { formatPosition } from "~/lib/geo/positions";
import { buildPartGeometry, parsePositionLines, type LonLat } from "~/lib/notices/geometry";
import { DETAIL_TYPES, GENERAL_TYPES, PART_KIND_LABELS, PART_KINDS, RESTRICTIONS, type PartKind } from "~/lib/notices/vocabulary";

export type FormValues = Record<string, string | string[] | undefined>;
export type EditorPart = { kind: PartKind; crs: string; positions: string; radiusNm: string };

const DRAW_MODE: Record<PartKind, DrawMode> = { point: "Point", line: "LineString", area: "Polygon", circle: "Circle" };

function str(v: FormValues[string]): string {
  return Array.isArray(v) ? (v[0] ?? "") : (v ?? "");
}
function list(v: FormValues[string]): string[] {
  return Array.isArray(v) ? v : v ? [v] : [];
}

export function partsFromValues(values: FormValues, defaultCrs: string): EditorPart[] {
  const parts: EditorPart[] = [];
  for (let i = 0; i < 8; i++) {
    if (values[`parts.${i}.kind`] === undefined && values[`parts.${i}.positions`] === undefined) continue;
    parts.push({
      kind: (str(values[`parts.${i}.kind`]) || "point") as PartKind,
      crs: str(values[`parts.${i}.crs`]) || defaultCrs,
      positions: str(values[`parts.${i}.positions`]),
      radiusNm: str(values[`parts.${i}.radiusNm`]),
    });
  }
  return parts.length ? parts : [{ kind: "area", crs: defaultCrs, positions: "", radiusNm: "" }];
}

/** A WGS 84 position written in the part's CRS, as an officer would type it. */
function writeIn(crs: string, [lon, lat]: LonLat): string {
  const c = fromWgs84(crs, lat, lon);
  if (isGeographicCoord(c)) return formatPosition(c.lat, c.lon, "ddm", { decimals: 3 });
  return `${c.easting.toFixed(1)} ${c.northing.toFixed(1)}`;
}

function PartEditor({
  index,
  part,
  errors,
  crsOptions,
  onChange,
  onRemove,
  drawing,
  onDraw,
}: {
  index: number;
  part: EditorPart;
  errors: Record<string, string | undefined>;
  crsOptions: { value: string; label: string }[];
  onChange: (p: EditorPart) => void;
  onRemove?: () => void;
  drawing: boolean;
  onDraw: () => void;
}) {
  const lines = useMemo(() => parsePositionLines(part.positions, part.crs), [part.positions, part.crs]);
  const prefix = `parts.${index}`;
  const feedbackId = `part-${index}-feedback`;
  return (
    <fieldset className="rounded-md border border-mist p-3" data-testid={`part-${index}`}>
      <legend className="px-1 font-semibold">Geometry part {index + 1}</legend>
      <div className="grid gap-3 sm:grid-cols-2">
        <Select
          label="Kind"
          name={`${prefix}.kind`}
          value={part.kind}
          onChange={(e) => onChange({ ...part, kind: e.target.value as PartKind })}
          options={PART_KINDS.map((k) => ({ value: k, label: PART_KIND_LABELS[k] }))}
          error={errors[`${prefix}.kind`]}
        />
        <Select
          label="Datum / grid of the positions"
          name={`${prefix}.crs`}
          value={part.crs}
          onChange={(e) => onChange({ ...part, crs: e.target.value })}
          options={crsOptions}
          error={errors[`${prefix}.crs`]}
        />
      </div>
      <TextArea
        className="mt-3"
        label={part.kind === "circle" ? "Centre position" : "Positions, one per line"}
        name={`${prefix}.positions`}
        rows={part.kind === "point" || part.kind === "circle" ? 2 : 5}
        value={part.positions}
        onChange={(e) => onChange({ ...part, positions: e.target.value })}
        error={errors[`${prefix}.positions`]}
        hint="Any usual format: 55°12.360′N 003°02.200′E, 55 12.36N 3 02.2E, 55.206 3.0367 … For a grid: easting northing in metres."
        spellCheck={false}
        style={{ fontFamily: "var(--font-mono)" }}
      />
      {part.kind === "circle" ? (
        <Field
          className="mt-3 max-w-xs"
          label="Radius (nautical miles)"
          name={`${prefix}.radiusNm`}
          inputMode="decimal"
          value={part.radiusNm}
          onChange={(e) => onChange({ ...part, radiusNm: e.target.value })}
          error={errors[`${prefix}.radiusNm`]}
        />
      ) : null}
      <ol id={feedbackId} className="mt-2 space-y-0.5 text-sm" aria-live="polite" data-testid={`part-${index}-feedback`}>
        {lines.map((l) =>
          l.ok ? (
            <li key={l.line} className="text-kelp">
              ✓ Line {l.line}: <span className="position">{formatPosition(l.lat, l.lon, "ddm", { decimals: 3 })}</span> (WGS 84)
            </li>
          ) : (
            <li key={l.line} className="font-semibold text-danger">
              ✗ Line {l.line}: {l.error}
            </li>
          ),
        )}
      </ol>
      <div className="mt-2 flex flex-wrap gap-2">
        <button type="button" className="btn-secondary" onClick={onDraw} aria-pressed={drawing}>
          {drawing ? "Drawing… (click on the map; double-click to finish)" : `Draw this ${part.kind} on the map`}
        </button>
        {onRemove ? (
          <button type="button" className="btn-secondary" onClick={onRemove}>
            Remove this part
          </button>
        ) : null}
      </div>
    </fieldset>
  );
}

export function NoticeEditor({
  values,
  errors,
  defaultCrs,
  crsOptions,
  aids,
  aidFeatures,
  basemap,
  tileUrl,
  status,
  canPublish,
  version,
}: {
  values: FormValues;
  errors: Record<string, string | undefined>;
  defaultCrs: string;
  crsOptions: { value: string; label: string }[];
  aids: { id: number; code: string; name: string }[];
  aidFeatures: MapFeature[];
  basemap: Basemap;
  tileUrl: string | null;
  status: "new" | "draft" | "in_force";
  canPublish: boolean;
  version: number | null;
}) {
  const busy = useNavigation().state === "submitting";
  const [parts, setParts] = useState<EditorPart[]>(() => partsFromValues(values, defaultCrs));
  const [drawIndex, setDrawIndex] = useState<number | null>(null);
  const [untilFurther, setUntilFurther] = useState(str(values.untilFurtherNotice) === "on");
  const detail = new Set(list(values.detailTypes));
  const restrictions = new Set(list(values.restrictions));
  const linkedAids = new Set(list(values.aidIds));

  const draftFeatures = useMemo<MapFeature[]>(() => {
    const out: MapFeature[] = [];
    parts.forEach((p, i) => {
      const coords = parsePositionLines(p.positions, p.crs)
        .filter((l) => l.ok)
        .map((l) => [(l as { lon: number }).lon, (l as { lat: number }).lat] as LonLat);
      if (!coords.length) return;
      const built = buildPartGeometry(p.kind, coords, p.kind === "circle" ? Number(p.radiusNm.replace(",", ".")) : null);
      if (built.ok) out.push({ type: "Feature", id: `part-${i}`, geometry: built.geometry, properties: { symbol: "draft", label: `Part ${i + 1}` } });
      else coords.forEach((c, k) => out.push({ type: "Feature", id: `part-${i}-${k}`, geometry: { type: "Point", coordinates: c }, properties: { symbol: "draft" } }));
    });
    return out;
  }, [parts]);
  const layers = useMemo(() => [{ id: "aids", features: aidFeatures }, { id: "draft", features: draftFeatures }], [aidFeatures, draftFeatures]);

  const update = (i: number, p: EditorPart) => setParts((ps) => ps.map((x, k) => (k === i ? p : x)));
  const onDrawEnd = (shape: DrawnShape) => {
    if (drawIndex === null) return;
    const p = parts[drawIndex]!;
    try {
      let positions = "";
      let radiusNm = p.radiusNm;
      if (shape.type === "Point") positions = writeIn(p.crs, shape.coordinates);
      else if (shape.type === "LineString") positions = shape.coordinates.map((c) => writeIn(p.crs, c)).join("\n");
      else if (shape.type === "Polygon") positions = shape.coordinates[0]!.slice(0, -1).map((c) => writeIn(p.crs, c)).join("\n");
      else {
        positions = writeIn(p.crs, shape.centre);
        radiusNm = (shape.radiusM / 1852).toFixed(3);
      }
      update(drawIndex, { ...p, positions, radiusNm });
    } finally {
      setDrawIndex(null);
    }
  };

  return (
    <Form method="post" className="space-y-5" noValidate>
      <input type="hidden" name="version" value={version ?? ""} />
      <FormError error={errors.form} />
      {errors.version ? (
        <div role="alert" className="rounded-md border-2 border-danger bg-danger-light px-4 py-3 font-semibold text-danger" data-testid="version-conflict">
          {errors.version}
        </div>
      ) : null}
      <div className="grid gap-4 lg:grid-cols-2">
        <div className="space-y-4">
          <Field label="Title (key subject)" name="title" defaultValue={str(values.title)} error={errors.title} required maxLength={160} />
          <div className="grid gap-3 sm:grid-cols-2">
            <Select label="General type (IHO S-124)" name="generalType" defaultValue={str(values.generalType) || "aids_to_navigation_changes"} options={GENERAL_TYPES.map((g) => ({ value: g.key, label: g.label }))} error={errors.generalType} />
            <fieldset>
              <legend className="field-label">Urgency</legend>
              <label className="mr-4 inline-flex items-center gap-2">
                <input type="radio" name="urgency" value="routine" defaultChecked={str(values.urgency) !== "urgent"} /> Routine
              </label>
              <label className="inline-flex items-center gap-2 font-semibold text-signal">
                <input type="radio" name="urgency" value="urgent" defaultChecked={str(values.urgency) === "urgent"} /> URGENT
              </label>
            </fieldset>
          </div>
          <details className="rounded-md border border-mist bg-white p-3" open={detail.size > 0 || !!errors.detailTypes}>
            <summary className="cursor-pointer font-semibold">Detail types ({detail.size} chosen)</summary>
            <div className="mt-2 grid gap-1 sm:grid-cols-2">
              {DETAIL_TYPES.map((d) => (
                <label key={d.code} className="inline-flex items-center gap-2 text-sm">
                  <input type="checkbox" name="detailTypes" value={d.code} defaultChecked={detail.has(String(d.code))} /> {d.label}
                </label>
              ))}
            </div>
            {errors.detailTypes ? <p className="field-error">{errors.detailTypes}</p> : null}
          </details>
          <details className="rounded-md border border-mist bg-white p-3" open={restrictions.size > 0}>
            <summary className="cursor-pointer font-semibold">Restrictions ({restrictions.size} chosen)</summary>
            <div className="mt-2 grid gap-1 sm:grid-cols-2">
              {RESTRICTIONS.map((r) => (
                <label key={r.code} className="inline-flex items-center gap-2 text-sm">
                  <input type="checkbox" name="restrictions" value={r.code} defaultChecked={restrictions.has(String(r.code))} /> {r.label}
                </label>
              ))}
            </div>
          </details>
          <div className="grid gap-3 sm:grid-cols-2">
            <Field label="In force from (harbour time)" name="validFrom" type="datetime-local" defaultValue={str(values.validFrom)} error={errors.validFrom} />
            <Field
              label="Until (harbour time)"
              name="validUntil"
              type="datetime-local"
              defaultValue={str(values.validUntil)}
              error={errors.validUntil}
              hint={untilFurther ? "Leave empty while “until further notice” is ticked" : undefined}
            />
          </div>
          <label className="inline-flex items-center gap-2">
            <input type="checkbox" name="untilFurtherNotice" checked={untilFurther} onChange={(e) => setUntilFurther(e.target.checked)} /> Until further notice
          </label>
          <div className="grid gap-3 sm:grid-cols-2">
            <Field label="General area" name="generalArea" defaultValue={str(values.generalArea)} error={errors.generalArea} />
            <Field label="Locality" name="locality" defaultValue={str(values.locality)} error={errors.locality} />
          </div>
          <div className="grid gap-3 sm:grid-cols-2">
            <Field label="Charts affected" name="charts" defaultValue={str(values.charts)} error={errors.charts} hint="Chart numbers as written, e.g. KS 101" />
            <Select
              label="Positions"
              name="positionStatus"
              defaultValue={str(values.positionStatus) || "reported"}
              options={[
                { value: "reported", label: "Reported (not surveyed)" },
                { value: "located", label: "Located (confirmed by survey)" },
              ]}
            />
          </div>
          <TextArea label="Text (amplifying remarks)" name="body" rows={5} defaultValue={str(values.body)} error={errors.body} />
          <Field label="Related notices" name="relatedRefs" defaultValue={str(values.relatedRefs)} error={errors.relatedRefs} hint="Series numbers, e.g. KSH 2026/003" />
          <details className="rounded-md border border-mist bg-white p-3" open={linkedAids.size > 0 || !!errors.aidIds}>
            <summary className="cursor-pointer font-semibold">Aids concerned ({linkedAids.size})</summary>
            <div className="mt-2 grid gap-1 sm:grid-cols-3">
              {aids.map((a) => (
                <label key={a.id} className="inline-flex items-center gap-2 text-sm" title={a.name}>
                  <input type="checkbox" name="aidIds" value={a.id} defaultChecked={linkedAids.has(String(a.id))} /> {a.code}
                </label>
              ))}
            </div>
            {errors.aidIds ? <p className="field-error">{errors.aidIds}</p> : null}
          </details>
          <Field label="Discrepancy reports (ids)" name="reportIds" defaultValue={list(values.reportIds).join(", ")} error={errors.reportIds} hint="Numbers of the reports this notice answers, comma-separated" />
        </div>
        <div className="space-y-4">
          <MapView
            ariaLabel="Map of the notice's geometry as typed; use the draw buttons to draw instead of typing."
            basemap={basemap}
            tileUrl={tileUrl}
            layers={layers}
            fit="layers"
            fitLayerId="draft"
            fitKey={parts.map((p) => p.positions.length > 0).join()}
            draw={{ mode: drawIndex === null ? null : DRAW_MODE[parts[drawIndex]!.kind], onDrawEnd }}
            height="26rem"
          />
          {parts.map((p, i) => (
            <PartEditor
              key={i}
              index={i}
              part={p}
              errors={errors}
              crsOptions={crsOptions}
              onChange={(np) => update(i, np)}
              onRemove={parts.length > 1 ? () => setParts((ps) => ps.filter((_, k) => k !== i)) : undefined}
              drawing={drawIndex === i}
              onDraw={() => setDrawIndex(drawIndex === i ? null : i)}
            />
          ))}
          {parts.length < 8 ? (
            <button type="button" className="btn-secondary" onClick={() => setParts((ps) => [...ps, { kind: "point", crs: ps.at(-1)?.crs ?? defaultCrs, positions: "", radiusNm: "" }])}>
              Add another part
            </button>
          ) : null}
          <div className={`rounded-md border p-3 ${errors.acceptOutside ? "border-warn bg-warn-light" : "border-mist bg-white"}`}>
            {errors.acceptOutside ? (
              <p className="mb-2 font-semibold text-warn" role="alert">
                Warning: {errors.acceptOutside}
              </p>
            ) : null}
            <label className="inline-flex items-center gap-2 text-sm">
              <input type="checkbox" name="acceptOutside" defaultChecked={str(values.acceptOutside) === "on"} /> Geometry outside the harbour boundary is intended
            </label>
          </div>
        </div>
      </div>
      <div className="flex flex-wrap gap-3 border-t border-mist pt-4">
        <button type="submit" name="intent" value="save" className="btn-secondary" disabled={busy}>
          {status === "in_force" ? "Save amendment" : "Save draft"}
        </button>
        {canPublish && status !== "in_force" ? (
          <button type="submit" name="intent" value="publish" className="btn-primary" disabled={busy}>
            Save and publish
          </button>
        ) : null}
        {status !== "in_force" && !canPublish ? <p className="self-center text-sm text-slate">A harbourmaster publishes drafts.</p> : null}
      </div>
    </Form>
  );
}
