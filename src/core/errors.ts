/**
 * Typed errors of the analysis core. Every message says what was wrong and what to do, in one line,
 * so that the command line and the web app can show it as it is.
 */
export class TessellabError extends Error {
  /** A short machine-readable kind, e.g. 'ImageTooLarge'. */
  readonly kind: string;
  constructor(kind: string, message: string) {
    super(message);
    this.kind = kind;
    this.name = `${kind}Error`;
  }
}

export class ImageDecodeError extends TessellabError {
  constructor(message: string) { super('ImageDecode', message); }
}
export class UnsupportedFormatError extends TessellabError {
  constructor(message: string) { super('UnsupportedFormat', message); }
}
export class ImageTooLargeError extends TessellabError {
  constructor(message: string) { super('ImageTooLarge', message); }
}
export class ImageTooSmallError extends TessellabError {
  constructor(message: string) { super('ImageTooSmall', message); }
}
export class NoCellsError extends TessellabError {
  constructor(message: string) { super('NoCells', message); }
}
export class TooFewCellsError extends TessellabError {
  constructor(message: string) { super('TooFewCells', message); }
}
/** A point set that cannot be tessellated: all on one line, coincident points, or points off the field. */
export class DegeneratePointsError extends TessellabError {
  constructor(message: string) { super('DegeneratePoints', message); }
}
export class CsvError extends TessellabError {
  constructor(message: string) { super('Csv', message); }
}
export class SettingsError extends TessellabError {
  constructor(message: string) { super('Settings', message); }
}
export class CalibrationError extends TessellabError {
  constructor(message: string) { super('Calibration', message); }
}
/** A label edit (merge, split, remove) that cannot be carried out as asked. */
export class EditError extends TessellabError {
  constructor(message: string) { super('Edit', message); }
}
/** An image series for kinetics that cannot be analysed as given (too few frames, times, sizes, fractions). */
export class SeriesError extends TessellabError {
  constructor(message: string) { super('Series', message); }
}
/** What a request needs is not there: an image not opened yet, a result not made yet, a stored copy deleted. */
export class MissingError extends TessellabError {
  constructor(message: string) { super('Missing', message); }
}
export class CancelledError extends TessellabError {
  constructor(message = 'The analysis was cancelled.') { super('Cancelled', message); }
}

/** One line for a person: the message of a TessellabError, or a generic line for anything else. */
export function describeError(e: unknown): string {
  if (e instanceof TessellabError) return e.message;
  if (e instanceof Error) return `Unexpected error: ${e.message}`;
  return `Unexpected error: ${String(e)}`;
}
