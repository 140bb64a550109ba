/**
 * One error type for every input the geo engine refuses. `field` is the dotted path of the
 * offending input (e.g. "observations.1.rangeNm") so forms and the JSON API can put the message
 * beside the right field.
 */
export class GeoInputError extends Error {
  readonly field: string;
  readonly code: string;

  constructor(message: string, field = "", code = "invalid") {
    super(message);
    this.name = "GeoInputError";
    this.field = field;
    this.code = code;
  }

  /** The same error, reported against another field path (used when a helper is reused). */
  at(field: string): GeoInputError {
    return new GeoInputError(this.message, field, this.code);
  }
}

export function isGeoInputError(e: unknown): e is GeoInputError {
  return e instanceof GeoInputError;
}
