// The subscribe / manage form. Works without JavaScript: positions are typed as mariners write
// them (one per line for a polygon); a map, where shown, only fills the same fields.
import { useState } from "react";
import type { Basemap } from "~/components/map/MapView";
import { Field, Select, TextArea } from "~/components/forms";
import { GENERAL_TYPES } from "~/lib/notices/vocabulary";
import { WEEKDAYS } from "~/lib/subscriptions/schedule";
import { SubscriptionMap, type AreaFields } from "./SubscriptionMap";

export type SubscriptionFormValues = {
  email?: string;
  areaKind?: string;
  centre?: string;
  radiusNm?: string;
  polygon?: string;
  generalTypes?: string[];
  urgentAlerts?: boolean;
  digestCadence?: string;
  digestLocalTime?: string;
  digestWeekday?: string;
};

export function SubscriptionFields({
  values,
  errors,
  withEmail,
  timeZone,
  harbourName,
  map,
}: {
  values: SubscriptionFormValues;
  errors: Record<string, string | undefined>;
  withEmail: boolean;
  timeZone: string;
  harbourName: string;
  map?: { basemap: Basemap; tileUrl?: string | null };
}) {
  const [area, setArea] = useState<AreaFields>({ areaKind: values.areaKind ?? "harbour", centre: values.centre ?? "", radiusNm: values.radiusNm ?? "", polygon: values.polygon ?? "" });
  const areaKind = area.areaKind;
  const update = (f: Partial<AreaFields>) => setArea((a) => ({ ...a, ...f }));
  const types = new Set(values.generalTypes ?? []);
  return (
    <>
      {withEmail ? (
        <Field label="E-mail address" name="email" type="email" autoComplete="email" required maxLength={254} defaultValue={values.email} error={errors.email} hint="We send a confirmation link first; nothing else until you confirm." />
      ) : null}

      <fieldset className="space-y-3">
        <legend className="field-label">Area of interest</legend>
        {[
          { v: "harbour", label: `All of ${harbourName}` },
          { v: "circle", label: "A circle around a position" },
          { v: "polygon", label: "A polygon (corners typed or drawn on the map)" },
        ].map((o) => (
          <label key={o.v} className="flex items-center gap-2">
            <input type="radio" name="areaKind" value={o.v} checked={areaKind === o.v} onChange={() => update({ areaKind: o.v })} />
            {o.label}
          </label>
        ))}
        {errors.areaKind ? (
          <p className="field-error" role="alert">
            {errors.areaKind}
          </p>
        ) : null}
        {/* Both area inputs stay readable (dimming them failed contrast); the choice above says which is used.
            Monospace in the inputs only: the "position" class on the whole field kept its label and hint on
            one line and widened the page past a phone's screen. */}
        <div className="grid gap-3 sm:grid-cols-[1fr_10rem]">
          <Field label="Centre (WGS 84)" name="centre" className="[&_.field-input]:font-mono" placeholder="55°12.00′N 003°02.00′E" value={area.centre} onChange={(e) => update({ centre: e.currentTarget.value })} error={errors.centre} hint="Degrees and minutes, decimal degrees or DMS; N/S E/W or signs." />
          <Field label="Radius (M)" name="radiusNm" inputMode="decimal" placeholder="1.5" value={area.radiusNm} onChange={(e) => update({ radiusNm: e.currentTarget.value })} error={errors.radiusNm} hint="Nautical miles." />
        </div>
        <div>
          <TextArea label="Polygon corners (WGS 84), one position per line" name="polygon" rows={5} className="[&_.field-input]:font-mono" placeholder={"55°13.0′N 003°00.0′E\n55°13.0′N 003°04.0′E\n55°11.0′N 003°04.0′E\n55°11.0′N 003°00.0′E"} value={area.polygon} onChange={(e) => update({ polygon: e.currentTarget.value })} error={errors.polygon} hint="At least three corners in order around the area; the polygon is closed for you." />
        </div>
        {map ? <SubscriptionMap fields={area} onChange={update} basemap={map.basemap} tileUrl={map.tileUrl} /> : null}
      </fieldset>

      <fieldset>
        <legend className="field-label">Notice types</legend>
        <p className="field-hint">Tick none to get every type.</p>
        <div className="mt-2 grid gap-1 sm:grid-cols-2">
          {GENERAL_TYPES.map((g) => (
            <label key={g.key} className="flex items-center gap-2 text-sm">
              <input type="checkbox" name="generalTypes" value={g.key} defaultChecked={types.has(g.key)} />
              {g.label}
            </label>
          ))}
        </div>
        {errors.generalTypes ? (
          <p className="field-error" role="alert">
            {errors.generalTypes}
          </p>
        ) : null}
      </fieldset>

      <fieldset className="space-y-3">
        <legend className="field-label">What to send</legend>
        <label className="flex items-center gap-2">
          <input type="checkbox" name="urgentAlerts" value="on" defaultChecked={values.urgentAlerts ?? true} />
          An alert at once when an urgent notice in my area is published, amended or cancelled
        </label>
        <div className="grid gap-3 sm:grid-cols-3">
          <Select
            label="Digest"
            name="digestCadence"
            defaultValue={values.digestCadence ?? "none"}
            error={errors.digestCadence}
            options={[
              { value: "none", label: "No digest" },
              { value: "daily", label: "Daily" },
              { value: "weekly", label: "Weekly" },
            ]}
          />
          <Field label={`Time (${timeZone})`} name="digestLocalTime" type="time" defaultValue={values.digestLocalTime ?? "07:00"} error={errors.digestLocalTime} />
          <Select
            label="Day (weekly)"
            name="digestWeekday"
            defaultValue={values.digestWeekday ?? "1"}
            error={errors.digestWeekday}
            options={WEEKDAYS.map((d, i) => ({ value: String(i + 1), label: d }))}
          />
        </div>
        <p className="field-hint">A digest lists what is new, amended, cancelled or expired since the previous one. Nothing is sent when nothing changed.</p>
      </fieldset>
    </>
  );
}

/** Submitted form values (after a 400) back into the shape the fields take. */
export function valuesFromSubmitted(v: Record<string, unknown>): SubscriptionFormValues {
  const str = (k: string) => (typeof v[k] === "string" ? (v[k] as string) : undefined);
  return {
    email: str("email"),
    areaKind: str("areaKind"),
    centre: str("centre"),
    radiusNm: str("radiusNm"),
    polygon: str("polygon"),
    generalTypes: Array.isArray(v.generalTypes) ? (v.generalTypes as string[]) : typeof v.generalTypes === "string" ? [v.generalTypes] : [],
    urgentAlerts: v.urgentAlerts !== undefined,
    digestCadence: str("digestCadence"),
    digestLocalTime: str("digestLocalTime"),
    digestWeekday: str("digestWeekday"),
  };
}
