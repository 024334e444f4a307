/**
 * The one error type of the calculation library. Every invalid input throws
 * an AeroInputError whose `field` names the offending input (for example
 * "massKg"), so forms and API routes can point at the right box.
 */
export class AeroInputError extends Error {
  /** The input's name as it appears in the library's types, e.g. "massKg". */
  readonly field: string;
  /** Where the field sits inside a larger input, e.g. ["cases", 2, "massKg"]. */
  readonly path: readonly (string | number)[];
  /** The rejected value, as received. */
  readonly value: unknown;

  constructor(field: string, message: string, value?: unknown, path?: readonly (string | number)[]) {
    super(message);
    this.name = "AeroInputError";
    this.field = field;
    this.value = value;
    this.path = path ?? [field];
    Object.setPrototypeOf(this, new.target.prototype);
  }
}

export function isAeroInputError(error: unknown): error is AeroInputError {
  return error instanceof AeroInputError;
}
