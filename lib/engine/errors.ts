/**
 * Errors the engine throws for input a caller can fix. Both carry an HTTP-ready
 * status and a `details` list so a route can turn them into the API error body
 * without knowing which part of the engine failed.
 */

export interface LineDetail {
  /** 1-based line number in the file as uploaded. */
  line: number;
  message: string;
}

export interface InputDetail {
  field?: string;
  index?: number;
  message: string;
}

/** A data file the reader cannot turn into a curve (422), or one too large (413). */
export class CurveReadError extends Error {
  readonly status: 422 | 413;
  readonly details: LineDetail[];

  constructor(message: string, details: LineDetail[] = [], status: 422 | 413 = 422) {
    super(message);
    this.name = 'CurveReadError';
    this.status = status;
    this.details = details;
  }
}

/** Well-formed but unusable model input: out-of-range optic, unknown line, bad points. */
export class EngineInputError extends Error {
  readonly status = 422 as const;
  readonly details: InputDetail[];

  constructor(message: string, details: InputDetail[] = []) {
    super(message);
    this.name = 'EngineInputError';
    this.details = details.length > 0 ? details : [{ message }];
  }
}
