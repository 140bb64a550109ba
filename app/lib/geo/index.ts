/**
 * Tidewire's position and geodesy engine (pure TypeScript: no React, no database, no I/O).
 * Browser-safe parts: positions, crs-registry, schemas. The rest uses proj4 and the World
 * Magnetic Model and is meant for the server.
 */
export * from "./errors";
export * from "./positions";
export {
  ELLIPSOIDS,
  DATUMS,
  getCrs,
  getDatum,
  listCrs,
  parseCrsCode,
  resolveTransformation,
  toPositionVector,
  type CrsDefinition,
  type CrsKind,
  type CrsSummary,
  type Datum,
  type DatumKey,
  type DatumTransformation,
} from "./crs-registry";
export {
  convert,
  conversionInfo,
  fromWgs84,
  isGeographicCoord,
  proj4Definition,
  resolveCrs,
  toWgs84,
  type Coord,
  type CrsInput,
  type GeographicCoord,
  type ProjectedCoord,
} from "./crs";
export * from "./geodesy";
export * from "./magnetic";
export * from "./uncertainty";
export * from "./observation";
export * from "./schemas";
export * from "./assessment";
