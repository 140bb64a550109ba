/**
 * Dates the magnetic models cover (no package imports, so forms can check a date in the
 * browser). WMM2020 is valid 2020.0–2025.0 and WMM2025 2025.0–2030.0 (NOAA/NCEI and BGS).
 */
export const MAGNETIC_MODEL_START_MS = Date.UTC(2020, 0, 1);
export const MAGNETIC_MODEL_END_MS = Date.UTC(2030, 0, 1);
