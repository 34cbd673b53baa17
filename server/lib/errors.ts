/**
 * The one error type services throw. The error handler (server/middleware/error-handler.ts) turns it
 * into `{ error: { code, message, details } }` with its status; anything else becomes 500 INTERNAL.
 * Codes are stable SCREAMING_SNAKE strings the client may branch on; messages are for people.
 */
export const ERROR_STATUS = {
  VALIDATION_FAILED: 400,
  MALFORMED_JSON: 400,
  TOKEN_INVALID: 400,
  BAD_REQUEST: 400,
  UNAUTHENTICATED: 401,
  INVALID_CREDENTIALS: 401,
  FORBIDDEN: 403,
  NOT_ASSIGNED: 403,
  CSRF_ORIGIN_MISMATCH: 403,
  NOT_FOUND: 404,
  ALREADY_MEMBER: 409,
  CONFLICT: 409,
  SURVEY_NOT_OPEN: 409,
  CONFLICT_ALREADY_RESOLVED: 409,
  ATTACHMENT_MISMATCH: 409,
  LENGTH_REQUIRED: 411,
  PAYLOAD_TOO_LARGE: 413,
  UNSUPPORTED_MEDIA_TYPE: 415,
  CHECKSUM_MISMATCH: 422,
  /** An upload whose content is not one of the accepted file types (whatever its name says). */
  UNSUPPORTED_FILE_TYPE: 415,
  /** An upload of an accepted type that cannot be read (truncated, corrupt). */
  UNREADABLE_IMAGE: 422,
  /** An SVG with scripts, event handlers or external references. */
  UNSAFE_SVG: 422,
  ANTENNA_FACTORS_INVALID: 400,
  RATE_LIMITED: 429,
  INTERNAL: 500,
  SERVICE_UNAVAILABLE: 503,
} as const;

export type ErrorCode = keyof typeof ERROR_STATUS;

export class AppError extends Error {
  override name = 'AppError';
  readonly status: number;

  constructor(
    readonly code: ErrorCode,
    message: string,
    readonly details?: unknown,
  ) {
    super(message);
    this.status = ERROR_STATUS[code];
  }
}

export const notFound = (what = 'That item') => new AppError('NOT_FOUND', `${what} was not found.`);
export const unauthenticated = () => new AppError('UNAUTHENTICATED', 'Sign in to continue.');
export const forbidden = () => new AppError('FORBIDDEN', 'Your role does not allow this.');
