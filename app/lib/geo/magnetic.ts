/**
 * Magnetic declination (variation) from the World Magnetic Model, via the geomagnetism package.
 *
 * Trap (STACK.md): geomagnetism 0.2.0 refuses dates after 2029-11-13 (it gives its WMM2025
 * file a five-year window from 2024-11-13) although WMM2025 is valid from 2025.0 to 2030.0
 * (NOAA/NCEI and BGS). We therefore build the models ourselves from the package's own
 * coefficients with the published validity windows: WMM2025 for 2025.0 ≤ t < 2030.0 and, for
 * older reports, WMM2020 for 2020.0 ≤ t < 2025.0. Dates outside 2020.0–2030.0 are refused
 * with a clear message rather than extrapolated.
 *
 * Heights are kilometres above the WGS 84 ellipsoid (the package's unit); observations at sea
 * use 0 km (the geoid–ellipsoid separation of up to ~0.1 km changes declination negligibly).
 * Declination is east-positive: true bearing = magnetic bearing + declination.
 */
import geomagnetism from "geomagnetism";
import { GeoInputError } from "./errors";
import { MAGNETIC_MODEL_END_MS, MAGNETIC_MODEL_START_MS } from "./magnetic-window";

/** Earliest instant we compute declination for: 2020-01-01T00:00Z (start of WMM2020). */
export const MAGNETIC_MODEL_START = new Date(MAGNETIC_MODEL_START_MS);
/** WMM2025 valid until 2030.0 (NOAA/NCEI & BGS, WMM2025 release). */
export const MAGNETIC_MODEL_END = new Date(MAGNETIC_MODEL_END_MS);
/** The package's own WMM2025 cut-off, kept to document (and test) the trap. */
export const PACKAGE_WMM2025_END = new Date("2029-11-13T03:00:00.000Z");

interface WmmModel {
  epoch: number;
  name: string;
  getTimedModel(date: Date, allowOutOfBoundsModel?: boolean): { point(p: number[]): { decl: number; incl: number; h: number; f: number } };
}

interface ModelWindow {
  name: "WMM2025" | "WMM2020";
  start: Date;
  end: Date;
  model: WmmModel;
}

let windows: ModelWindow[] | null = null;

/**
 * The package's timed model at exactly its epoch (dyear = 0) carries the epoch coefficients and
 * the secular variation unchanged; rebuild a model from them with the published validity window.
 */
function rebuild(epochDate: Date, end: Date): WmmModel {
  const timed = geomagnetism.model(epochDate) as unknown as WmmModel & Record<string, unknown>;
  const Ctor = (timed as unknown as { constructor: new (o: Record<string, unknown>) => WmmModel }).constructor;
  return new Ctor({
    epoch: timed.epoch,
    name: timed.name,
    start_date: epochDate.toISOString(),
    end_date: end.toISOString(),
    n_max: timed.n_max,
    n_max_sec_var: timed.n_max_sec_var,
    main_field_coeff_g: timed.main_field_coeff_g,
    main_field_coeff_h: timed.main_field_coeff_h,
    secular_var_coeff_g: timed.secular_var_coeff_g,
    secular_var_coeff_h: timed.secular_var_coeff_h,
  });
}

function modelWindows(): ModelWindow[] {
  if (!windows) {
    const y2020 = new Date(Date.UTC(2020, 0, 1));
    const y2025 = new Date(Date.UTC(2025, 0, 1));
    windows = [
      { name: "WMM2025", start: y2025, end: MAGNETIC_MODEL_END, model: rebuild(y2025, MAGNETIC_MODEL_END) },
      { name: "WMM2020", start: y2020, end: y2025, model: rebuild(y2020, y2025) },
    ];
    for (const w of windows) {
      if (w.model.epoch !== Number(w.name.slice(3))) throw new Error(`geomagnetism returned ${w.model.name} for ${w.name}`);
    }
  }
  return windows;
}

export interface Declination {
  declinationDeg: number;
  model: "WMM2025" | "WMM2020";
  /** Decimal year as the package computes it (365-day years). */
  decimalYear: number;
}

// The timed model (coefficients at one instant) is reused while requests ask for the same
// instant — several observations of one report, or a repeated request.
let lastTimed: { t: number; name: string; model: ReturnType<WmmModel["getTimedModel"]> } | null = null;
let lastPoint: { lat: number; lon: number; h: number; decl: number } | null = null;

/**
 * Declination (east positive) at a place and time. Throws GeoInputError when the date is
 * outside 2020.0–2030.0 or the place is not a valid latitude/longitude.
 */
export function magneticDeclination(lat: number, lon: number, at: Date, heightKm = 0, field = "observedAt"): Declination {
  const t = at.getTime();
  if (!Number.isFinite(t)) throw new GeoInputError("Give the date and time of the observation", field, "invalid_date");
  if (!(Math.abs(lat) <= 90 && Math.abs(lon) <= 180)) throw new GeoInputError("Position out of range", "position", "out_of_range");
  const w = modelWindows().find((x) => t >= x.start.getTime() && t < x.end.getTime());
  if (!w) {
    const iso = at.toISOString().slice(0, 10);
    throw new GeoInputError(
      t >= MAGNETIC_MODEL_END.getTime()
        ? `${iso} is after the World Magnetic Model 2025 validity (to 2030-01-01): magnetic variation cannot be computed`
        : `${iso} is before 2020-01-01, the earliest date Tidewire's magnetic models cover`,
      field,
      "date_outside_magnetic_model",
    );
  }
  if (!lastTimed || lastTimed.t !== t || lastTimed.name !== w.name) {
    lastTimed = { t, name: w.name, model: w.model.getTimedModel(at) };
    lastPoint = null;
  }
  if (!lastPoint || lastPoint.lat !== lat || lastPoint.lon !== lon || lastPoint.h !== heightKm) {
    lastPoint = { lat, lon, h: heightKm, decl: lastTimed.model.point([lat, lon, heightKm]).decl };
  }
  const p = { decl: lastPoint.decl };
  const year = at.getUTCFullYear();
  return {
    declinationDeg: p.decl,
    model: w.name,
    decimalYear: year + (t - Date.UTC(year, 0, 1)) / (1000 * 3600 * 24 * 365),
  };
}

/** True bearing from a magnetic one: declination is east-positive (true = magnetic + declination). */
export function magneticToTrue(magneticDeg: number, declinationDeg: number): number {
  const b = (magneticDeg + declinationDeg) % 360;
  return b < 0 ? b + 360 : b;
}
