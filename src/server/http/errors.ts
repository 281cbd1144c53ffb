/** Error codes of the one error shape `{ error: { code, message, fields? } }` (STYLE.md). */
export type ErrorCode =
  | 'BAD_REQUEST'
  | 'BAD_JSON'
  | 'VALIDATION'
  | 'UNAUTHENTICATED'
  | 'FORBIDDEN'
  | 'NOT_FOUND'
  | 'CONFLICT'
  /** A DICOM object's Patient ID or accession is not the chosen exam's; resend with the mismatch confirmed. */
  | 'IDENTITY_MISMATCH'
  | 'STALE'
  /** The report is signed: only an addendum may follow. */
  | 'SIGNED'
  | 'POSSIBLE_DUPLICATE'
  | 'RULE'
  | 'PAYLOAD_TOO_LARGE'
  | 'UNSUPPORTED_MEDIA_TYPE'
  | 'DEPENDENCY_DOWN'
  | 'INTERNAL';

/** Thrown by services and routes; endpoint() turns it into a JSON answer. */
export class HttpError extends Error {
  constructor(
    readonly status: number,
    readonly code: ErrorCode,
    message: string,
    readonly fields?: Record<string, string>,
    /** More members of the error object, e.g. `{ candidates }` of a POSSIBLE_DUPLICATE. */
    readonly extra?: Record<string, unknown>,
  ) {
    super(message);
    this.name = 'HttpError';
  }
}

export const notFound = (what: string) => new HttpError(404, 'NOT_FOUND', `${what} was not found.`);
export const conflict = (message: string) => new HttpError(409, 'CONFLICT', message);
export const stale = (what: string) =>
  new HttpError(409, 'STALE', `Someone else changed this ${what} after you opened it. Reload to see their change, then try again.`);
export const ruleBroken = (message: string, fields?: Record<string, string>) =>
  new HttpError(422, 'RULE', message, fields);
