import { useCallback, useEffect, useMemo, useRef, useState } from "react";
import { data, Form, useNavigation } from "react-router";
import type { Route } from "./+types/report";
import { Caution } from "~/components/Caution";
import { Field, FormError, Select, TextArea } from "~/components/forms";
import { rateLimited } from "~/services/rate-limit.server";
import { PhotoUploader, type UploadedPhoto } from "~/components/reports/PhotoUploader";
import { AssessmentSummary, type PreviewState } from "~/components/reports/AssessmentSummary";
import { ReportMap } from "~/components/reports/ReportMap";
import { IALA_CATEGORY_LABELS, type IalaCategory } from "~/lib/aids/iala";
import { swingRadiusOf } from "~/lib/aids/schema";
import { formatPosition } from "~/lib/geo/positions";
import type { AssessmentResponse } from "~/lib/geo/assessment";
import {
  assessmentInputFor,
  METHOD_LABELS,
  observationWithTime,
  photoMismatches,
  submissionFromForm,
  typedOwnPosition,
  formFieldFor,
  type ReportFormValues,
} from "~/lib/reports/schema";
import { formatInZone, isoToZonedLocal, zonedLocalToIso } from "~/lib/reports/time";
import { listAids } from "~/models/aid.server";
import { getDefaultHarbour } from "~/models/harbour.server";
import { storeProcessedPhoto } from "~/models/photo.server";
import { getOptionalUser } from "~/services/auth.server";
import { formValues, readForm } from "~/services/form.server";
import { MAX_PHOTOS_PER_REPORT, PhotoRejectedError, processPhoto } from "~/services/photo-processing.server";
import { submitReport } from "~/services/report-submit.server";
import { redirectWithToast } from "~/services/session.server";
import { STORAGE_UNAVAILABLE_MESSAGE, StorageUnavailableError } from "~/services/storage.server";

export const meta: Route.MetaFunction = () => [{ title: "Report an aid to navigation · Tidewire" }];

export async function loader({ request }: Route.LoaderArgs) {
  const user = await getOptionalUser(request);
  const harbour = await getDefaultHarbour();
  if (!harbour) throw data({ error: "No harbour is set up yet." }, { status: 404 });
  const aids = await listAids(harbour.id);
  const url = new URL(request.url);
  const pre = url.searchParams.get("aid");
  const preselected = aids.find((a) => a.code === pre || String(a.id) === pre)?.id ?? null;
  return {
    user: user ? { name: user.name, email: user.email } : null,
    harbour: { name: harbour.name, timeZone: harbour.timeZone, basemap: harbour.basemap, vhf: harbour.vhfContact },
    aids: aids.map((a) => ({
      id: a.id,
      code: a.code,
      name: a.name,
      category: a.ialaCategory,
      aidType: a.aidType,
      status: a.status,
      lat: a.lat,
      lon: a.lon,
      chartedPositionText: a.chartedPositionText,
      chartedCrs: a.chartedCrs,
      chainLengthM: a.chainLengthM,
      depthM: a.depthM,
      swingRadiusM: a.swingRadiusM,
    })),
    preselected,
    nowLocal: isoToZonedLocal(new Date(), harbour.timeZone),
  };
}

type ActionFailure = { errors: Record<string, string | undefined>; values: Record<string, string>; uploads: UploadedPhoto[] };

export async function action({ request, context }: Route.ActionArgs) {
  const user = await getOptionalUser(request);
  const harbour = await getDefaultHarbour();
  if (!harbour) throw data({ error: "No harbour is set up yet." }, { status: 404 });
  const form = await readForm(request);
  const values = formValues(form, ["photos", "uploadId"]);
  const uploadIds = form.getAll("uploadId").filter((v): v is string => typeof v === "string" && v.length > 0);
  const files = form.getAll("photos").filter((v): v is File => typeof v === "object" && v !== null && "arrayBuffer" in v && (v as File).size > 0);
  const uploads: UploadedPhoto[] = uploadIds.map((id) => ({ id, name: "photo", thumbUrl: `/photos/${id}/thumb`, exif: { lat: null, lon: null, takenAt: null } }));
  const failure = (status: number, errors: Record<string, string | undefined>) => data<ActionFailure>({ errors, values, uploads }, { status });

  const limited = await rateLimited("report", request, context);
  if (limited) return data<ActionFailure>({ errors: { form: limited.message }, values, uploads }, { status: 429, headers: { "Retry-After": String(limited.retryAfterS) } });
  if (files.length + uploadIds.length > MAX_PHOTOS_PER_REPORT) {
    return failure(400, { photos: `At most ${MAX_PHOTOS_PER_REPORT} photos per report (you added ${files.length + uploadIds.length}).` });
  }
  // Photos sent with the form (no JavaScript): check and store each, keeping the good ones as
  // uploads so a correction of another field does not need them again.
  const photoErrors: string[] = [];
  for (const file of files) {
    try {
      const processed = await processPhoto(Buffer.from(await file.arrayBuffer()), { name: file.name, timeZone: harbour.timeZone });
      const stored = await storeProcessedPhoto(processed, user?.id ?? null);
      uploadIds.push(stored.id);
      uploads.push({ id: stored.id, name: file.name, thumbUrl: `/photos/${stored.id}/thumb`, exif: { lat: stored.exif.lat, lon: stored.exif.lon, takenAt: processed.exif.takenAt } });
    } catch (e) {
      if (e instanceof PhotoRejectedError) photoErrors.push(e.message);
      else if (e instanceof StorageUnavailableError) return failure(503, { form: STORAGE_UNAVAILABLE_MESSAGE, photos: "Photos could not be stored just now." });
      else throw e;
    }
  }
  if (photoErrors.length) return failure(400, { photos: photoErrors.join(" ") });

  const observedAtIso = values.observedAt ? zonedLocalToIso(values.observedAt, harbour.timeZone) : null;
  if (!observedAtIso) return failure(400, { observedAt: "Give the date and time you made the observation" });
  const submission = submissionFromForm({ ...(values as ReportFormValues), observedAtIso }, uploadIds);
  const result = await submitReport(submission, { user, harbour });
  if (!result.ok) {
    const errors: Record<string, string> = {};
    for (const [path, msg] of Object.entries(result.errors)) errors[formFieldFor(path, values.method)] ??= msg;
    if (result.status === 503) errors.form = result.error;
    return failure(result.status, errors);
  }
  const to = user ? `/reports/${result.reportId}` : result.followUrl.replace(/^https?:\/\/[^/]+/, "");
  return redirectWithToast(request, to, {
    kind: "success",
    message: `Report ${result.reference} sent. ${user ? "You can follow it under My reports." : "We have e-mailed you a link to follow it."}`,
  });
}

type LoaderAid = Route.ComponentProps["loaderData"]["aids"][number];

function useHydrated() {
  const [h, setH] = useState(false);
  useEffect(() => setH(true), []);
  return h;
}

export default function ReportPage({ loaderData, actionData }: Route.ComponentProps) {
  const { aids, harbour, user, preselected, nowLocal } = loaderData;
  const failure = actionData as ActionFailure | undefined;
  const errors = failure?.errors ?? {};
  const v = failure?.values ?? {};
  const hydrated = useHydrated();
  const navigation = useNavigation();
  const formRef = useRef<HTMLFormElement>(null);
  const [target, setTarget] = useState(v.target ?? "aid");
  const [method, setMethod] = useState(v.method ?? "radar");
  const [aidId, setAidId] = useState<number | null>(v.aidId ? Number(v.aidId) : preselected);
  const [bearingRef, setBearingRef] = useState(v["radar.bearingRef"] ?? "true");
  const [photos, setPhotos] = useState<UploadedPhoto[]>(failure?.uploads ?? []);
  const [preview, setPreview] = useState<PreviewState>({ kind: "idle" });
  const [formTick, setFormTick] = useState(0);
  const aid = aids.find((a) => a.id === aidId) ?? null;

  const readValues = useCallback((): ReportFormValues => {
    const out: ReportFormValues = {};
    if (!formRef.current) return out;
    for (const [k, val] of new FormData(formRef.current)) if (typeof val === "string") out[k] = val;
    return out;
  }, []);

  // Live preview through POST /api/v1/assessments (the same engine the submission uses).
  useEffect(() => {
    if (!hydrated) return;
    if (target !== "aid" || !aid) {
      setPreview({ kind: "idle" });
      return;
    }
    const f = readValues();
    const iso = f.observedAt ? zonedLocalToIso(f.observedAt, harbour.timeZone) : null;
    const sub = submissionFromForm({ ...f, observedAtIso: iso ?? undefined }, []);
    const obs = sub.observation as Record<string, unknown>;
    const complete = obs.method === "gnss" ? !!obs.position : !!obs.ownPosition && (obs.method === "radar" ? obs.rangeNm !== undefined && obs.bearingDeg !== undefined && obs.rangeScaleNm !== undefined : obs.bearingMagneticDeg !== undefined && obs.distanceM !== undefined);
    if (!complete || !iso) {
      setPreview({ kind: "idle" });
      return;
    }
    const input = assessmentInputFor(aid, [observationWithTime(obs, iso)]);
    const ctrl = new AbortController();
    const t = setTimeout(() => {
      setPreview((p) => (p.kind === "ready" ? p : { kind: "loading" }));
      fetch("/api/v1/assessments", { method: "POST", headers: { "Content-Type": "application/json" }, body: JSON.stringify(input), signal: ctrl.signal })
        .then(async (res) => {
          const body = await res.json().catch(() => null);
          if (res.ok) setPreview({ kind: "ready", result: body as AssessmentResponse });
          else setPreview({ kind: "error", message: body?.error ?? `The preview is not available (${res.status})`, field: body?.field });
        })
        .catch((e) => {
          if ((e as Error).name !== "AbortError") setPreview({ kind: "error", message: "The preview is not available just now; you can still send the report." });
        });
    }, 350);
    return () => {
      clearTimeout(t);
      ctrl.abort();
    };
  }, [hydrated, target, aid, method, bearingRef, formTick, readValues, harbour.timeZone]);

  const flags = useMemo(() => {
    if (!hydrated || photos.length === 0) return [];
    const f = readValues();
    const iso = f.observedAt ? zonedLocalToIso(f.observedAt, harbour.timeZone) : null;
    const sub = submissionFromForm({ ...f, observedAtIso: iso ?? undefined }, []);
    return photoMismatches(photos.map((p) => p.exif), typedOwnPosition(sub.observation as Record<string, unknown>), iso);
    // formTick: recompute when the typed values change
    // eslint-disable-next-line react-hooks/exhaustive-deps
  }, [hydrated, photos, formTick, method, readValues, harbour.timeZone]);

  function setField(name: string, value: string) {
    const el = formRef.current?.elements.namedItem(name) as HTMLInputElement | null;
    if (el) {
      el.value = value;
      setFormTick((t) => t + 1);
    }
  }

  const ownField = method === "gnss" ? "gnss.position" : `${method}.ownPosition`;
  const err = (name: string) => errors[name];
  const show = (m: string) => !hydrated || method === m;
  const diagramPreview =
    preview.kind === "ready"
      ? {
          charted: preview.result.charted,
          swingRadiusM: preview.result.swingRadiusM,
          observations: preview.result.observations.map((o) => ({ lat: o.lat, lon: o.lon, uncertaintyM: o.uncertaintyM })),
          estimate: null,
        }
      : aid
        ? { charted: { lat: aid.lat, lon: aid.lon }, swingRadiusM: swingRadiusOf(aid) ?? 0, observations: [], estimate: null }
        : null;

  return (
    <div className="mx-auto max-w-5xl">
      <h1 className="text-2xl font-bold">Report an aid to navigation</h1>
      <p className="mt-2 max-w-3xl text-slate">
        Seen a buoy or beacon away from its charted position, damaged or unlit, or a hazard not on the chart? Tell the {harbour.name} harbour
        office. For anything urgent call {harbour.vhf ?? "the harbour office on VHF"}.
      </p>
      <div className="mt-4">
        <Caution compact />
      </div>

      <Form
        method="post"
        encType="multipart/form-data"
        ref={formRef}
        className="mt-6 grid gap-6 lg:grid-cols-[1fr_22rem]"
        onChange={() => setFormTick((t) => t + 1)}
        noValidate
      >
        <div className="grid gap-6">
          {/* A summary whenever anything was refused, so an error on a field that is hidden for the
              chosen method (or on an unexpected field) is never silent. */}
          <FormError error={errors.form ?? (Object.values(errors).some(Boolean) ? "Some answers need correcting: see the messages below." : undefined)} />
          <fieldset className="card grid gap-4">
            <legend className="px-1 text-lg font-bold">1. What did you see?</legend>
            <div className="flex flex-wrap gap-4">
              <label className="flex items-center gap-2">
                <input type="radio" name="target" value="aid" checked={target === "aid"} onChange={() => setTarget("aid")} /> An aid to navigation
              </label>
              <label className="flex items-center gap-2">
                <input type="radio" name="target" value="hazard" checked={target === "hazard"} onChange={() => setTarget("hazard")} /> An uncharted hazard
              </label>
            </div>
            {!hydrated || target === "aid" ? (
              <Select
                label="Aid (or choose it on the map)"
                name="aidId"
                value={aidId ? String(aidId) : ""}
                onChange={(e) => setAidId(e.currentTarget.value ? Number(e.currentTarget.value) : null)}
                error={err("aidId")}
                options={[{ value: "", label: "Choose an aid…" }, ...aids.map((a) => ({ value: String(a.id), label: `${a.code} · ${a.name}` }))]}
              />
            ) : null}
            {aid && (!hydrated || target === "aid") ? <AidFacts aid={aid} /> : null}
            {!hydrated || target === "hazard" ? (
              <TextArea
                label="Describe the hazard (uncharted)"
                name="hazardDescription"
                rows={2}
                defaultValue={v.hazardDescription}
                error={err("hazardDescription")}
                hint="e.g. a half-submerged container, a new shoal, a drifting mark. Its position comes from your observation below."
              />
            ) : null}
            <ReportMap
              aids={aids}
              selectedAidId={aidId}
              onSelectAid={(id) => {
                setTarget("aid");
                setAidId(id);
              }}
              basemap={harbour.basemap}
              diagram={target === "aid" ? diagramPreview : null}
              ariaLabel="Map of the aids; choose one by clicking it. After you enter an observation it shows the swing circle around the charted position and your observed position with its 95% uncertainty circle (dashed). The same figures are in the preview panel."
            />
          </fieldset>

          <fieldset className="card grid gap-4">
            <legend className="px-1 text-lg font-bold">2. How did you observe it?</legend>
            <div className="grid gap-2">
              {(["gnss", "radar", "compass"] as const).map((m) => (
                <label key={m} className="flex items-center gap-2">
                  <input type="radio" name="method" value={m} checked={method === m} onChange={() => setMethod(m)} /> {METHOD_LABELS[m]}
                </label>
              ))}
              {err("method") ? <p className="field-error">{err("method")}</p> : null}
            </div>
            {show("gnss") ? (
              <div className="grid gap-3 rounded-md bg-foam p-3" data-method="gnss">
                {!hydrated ? <p className="text-sm font-semibold">If you chose own GNSS position:</p> : null}
                <Field label="Your GNSS position alongside the mark (WGS 84)" name="gnss.position" defaultValue={v["gnss.position"]} error={err("gnss.position")} hint="e.g. 55°11.52′N 003°00.95′E or 55.1920 3.0158" className="position" />
              </div>
            ) : null}
            {show("radar") ? (
              <div className="grid gap-3 rounded-md bg-foam p-3 sm:grid-cols-2" data-method="radar">
                {!hydrated ? <p className="text-sm font-semibold sm:col-span-2">If you chose radar:</p> : null}
                <Field className="sm:col-span-2" label="Own position (WGS 84)" name="radar.ownPosition" defaultValue={v["radar.ownPosition"]} error={err("radar.ownPosition")} hint="Your GNSS position when you took the range and bearing" />
                <Field label="Range (M)" name="radar.rangeNm" inputMode="decimal" defaultValue={v["radar.rangeNm"]} error={err("radar.rangeNm")} hint="nautical miles, e.g. 0.42" />
                <Field label="Range scale in use (M)" name="radar.rangeScaleNm" inputMode="decimal" defaultValue={v["radar.rangeScaleNm"]} error={err("radar.rangeScaleNm")} hint="e.g. 0.75, 1.5, 3" />
                <Field label="Bearing (°)" name="radar.bearingDeg" inputMode="decimal" defaultValue={v["radar.bearingDeg"]} error={err("radar.bearingDeg")} hint="0 to 360" />
                <Select
                  label="Bearing reference"
                  name="radar.bearingRef"
                  value={bearingRef}
                  onChange={(e) => setBearingRef(e.currentTarget.value)}
                  error={err("radar.bearingRef")}
                  options={[
                    { value: "true", label: "True (north up)" },
                    { value: "relative", label: "Relative to the ship's head" },
                  ]}
                />
                {!hydrated || bearingRef === "relative" ? (
                  <Field label="Ship's heading (°T), for a relative bearing" name="radar.headingTrueDeg" inputMode="decimal" defaultValue={v["radar.headingTrueDeg"]} error={err("radar.headingTrueDeg")} />
                ) : null}
              </div>
            ) : null}
            {show("compass") ? (
              <div className="grid gap-3 rounded-md bg-foam p-3 sm:grid-cols-2" data-method="compass">
                {!hydrated ? <p className="text-sm font-semibold sm:col-span-2">If you chose compass:</p> : null}
                <Field className="sm:col-span-2" label="Own position (WGS 84)" name="compass.ownPosition" defaultValue={v["compass.ownPosition"]} error={err("compass.ownPosition")} />
                <Field label="Compass bearing (°M, magnetic)" name="compass.bearingMagneticDeg" inputMode="decimal" defaultValue={v["compass.bearingMagneticDeg"]} error={err("compass.bearingMagneticDeg")} hint="Converted to true with the World Magnetic Model" />
                <Field label="Estimated distance (m)" name="compass.distanceM" inputMode="decimal" defaultValue={v["compass.distanceM"]} error={err("compass.distanceM")} />
              </div>
            ) : null}
            <Field
              label={`Observation time (${harbour.timeZone})`}
              name="observedAt"
              type="datetime-local"
              defaultValue={v.observedAt ?? nowLocal}
              error={err("observedAt")}
              max={nowLocal}
            />
          </fieldset>

          <fieldset className="card grid gap-4">
            <legend className="px-1 text-lg font-bold">3. Photos and remarks</legend>
            <PhotoUploader
              initial={photos}
              error={err("photos")}
              onChange={setPhotos}
              formatPosition={(lat, lon) => formatPosition(lat, lon, "ddm", { decimals: 3 })}
              formatTime={(iso) => formatInZone(iso, harbour.timeZone)}
              onUsePosition={(p) => setField(ownField, formatPosition(p.exif.lat!, p.exif.lon!, "ddm", { decimals: 3 }))}
              onUseTime={(p) => setField("observedAt", isoToZonedLocal(p.exif.takenAt!, harbour.timeZone))}
            />
            {flags.length ? (
              <div role="status" className="rounded-md border border-warn/40 bg-warn-light px-3 py-2 text-sm" data-testid="photo-flags">
                <strong>Check:</strong>
                <ul className="list-disc pl-5">
                  {flags.map((f) => (
                    <li key={f}>{f}</li>
                  ))}
                </ul>
              </div>
            ) : null}
            <TextArea label="Remarks" name="remarks" rows={3} defaultValue={v.remarks} error={err("remarks")} hint="What you saw: light, topmark, damage, sea state…" />
          </fieldset>

          <fieldset className="card grid gap-4 sm:grid-cols-2">
            <legend className="px-1 text-lg font-bold">4. You</legend>
            {user ? (
              <p className="sm:col-span-2">
                Signed in as <strong>{user.name}</strong> ({user.email}). You can follow this report under My reports.
              </p>
            ) : (
              <>
                <Field className="sm:col-span-2" label="Your e-mail address" name="reporterEmail" type="email" autoComplete="email" defaultValue={v.reporterEmail} error={err("reporterEmail")} hint="We send a confirmation with a link to follow your report; nothing else." />
                <Field label="Your name (optional)" name="reporterName" autoComplete="name" defaultValue={v.reporterName} error={err("reporterName")} />
              </>
            )}
            <Field label="Vessel (optional)" name="reporterVessel" defaultValue={v.reporterVessel} error={err("reporterVessel")} />
          </fieldset>

          <div>
            <button type="submit" className="btn-primary" disabled={navigation.state === "submitting"}>
              {navigation.state === "submitting" ? "Sending…" : "Send report"}
            </button>
          </div>
        </div>

        <aside className="lg:sticky lg:top-4 lg:self-start">
          <div className="card" aria-live="polite" data-testid="assessment-preview">
            <h2 className="text-lg font-bold">Preview</h2>
            {target === "hazard" ? (
              <p className="mt-2 text-sm text-slate">An uncharted hazard has no charted position to compare with; its position comes from your observation.</p>
            ) : !hydrated ? (
              <p className="mt-2 text-sm text-slate">The displacement and verdict are worked out when you send the report.</p>
            ) : (
              <AssessmentSummary state={preview} />
            )}
          </div>
        </aside>
      </Form>
    </div>
  );
}

function AidFacts({ aid }: { aid: LoaderAid }) {
  const swing = swingRadiusOf(aid);
  return (
    <dl className="grid grid-cols-[auto_1fr] gap-x-4 gap-y-1 rounded-md bg-foam p-3 text-sm" data-testid="aid-facts">
      <dt className="text-slate">Charted</dt>
      <dd className="position">
        {aid.chartedPositionText} ({aid.chartedCrs})
      </dd>
      <dt className="text-slate">Category</dt>
      <dd>{aid.category ? IALA_CATEGORY_LABELS[aid.category as IalaCategory] : "—"}</dd>
      <dt className="text-slate">Swing circle</dt>
      <dd>
        {swing === null ? "not known" : `${swing.toFixed(1)} m`}
        {aid.swingRadiusM === null && aid.chainLengthM !== null ? ` (chain ${aid.chainLengthM} m in ${aid.depthM} m at low water)` : aid.swingRadiusM !== null ? " (stated)" : ""}
      </dd>
    </dl>
  );
}
