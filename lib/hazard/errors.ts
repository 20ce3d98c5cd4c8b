/**
 * The one error type of the physics engine. Every nonsense input (NaN, Infinity, temperatures
 * below absolute zero, non-positive molar masses, unusable correlations, missing data) throws this,
 * so callers can map it to a 400-style answer instead of ever seeing NaN in a result.
 */
export type HazardErrorCode =
  | 'not-finite'
  | 'below-absolute-zero'
  | 'not-positive'
  | 'negative'
  | 'out-of-range'
  | 'invalid-correlation'
  | 'correlation-singular'
  | 'no-method'
  | 'empty-input'
  | 'invalid-option';

export class HazardInputError extends Error {
  readonly code: HazardErrorCode;
  /** The input that was rejected, e.g. `tempC` or `props.molarMassGPerMol`. */
  readonly field: string;

  constructor(code: HazardErrorCode, field: string, message: string) {
    super(message);
    this.name = 'HazardInputError';
    this.code = code;
    this.field = field;
  }
}
