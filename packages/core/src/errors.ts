/** Typed errors thrown by the rules core. Callers map them to HTTP in one place. */
export class CoreInputError extends Error {
  override readonly name = "CoreInputError";
  constructor(
    message: string,
    readonly field?: string,
  ) {
    super(message);
  }
}

/** A refrigerant designation that the shipped catalogue does not know. */
export class UnknownRefrigerantError extends Error {
  override readonly name = "UnknownRefrigerantError";
  constructor(readonly designation: string) {
    super(`Refrigerant ${designation} is not in the catalogue`);
  }
}

/** A value asked for outside the range of a shipped data table (no extrapolation). */
export class OutOfTableRangeError extends Error {
  override readonly name = "OutOfTableRangeError";
  constructor(message: string) {
    super(message);
  }
}
