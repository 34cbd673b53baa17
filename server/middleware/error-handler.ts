/**
 * The one error handler: every failure leaves as `{ error: { code, message, details? } }`.
 * AppError keeps its code and status; validation failures list field paths; body-parser's errors
 * (bad JSON, too large) become 400/413; a database that cannot be reached is 503; anything else is
 * 500 INTERNAL with no internals in the body, logged with the request id.
 */
import type { ErrorRequestHandler, RequestHandler } from 'express';
import { AppError, ERROR_STATUS, type ErrorCode } from '../lib/errors';
import type { Logger } from '../lib/logger';
import { InputError } from './validate';

interface ErrorBody {
  error: { code: string; message: string; details?: unknown };
}

function body(code: string, message: string, details?: unknown): ErrorBody {
  return { error: { code, message, ...(details === undefined ? {} : { details }) } };
}

/** Connection-level failures: the database is down or restarting, not a bug in the request. */
const UNAVAILABLE_CODES = new Set(['ECONNREFUSED', 'ECONNRESET', 'ETIMEDOUT', 'ENOTFOUND', 'EHOSTUNREACH', '57P01', '57P03', '53300']);

function isDatabaseUnavailable(error: unknown): boolean {
  let current: unknown = error;
  for (let depth = 0; current && depth < 4; depth += 1) {
    const code = (current as { code?: unknown }).code;
    if (typeof code === 'string' && UNAVAILABLE_CODES.has(code)) return true;
    if (current instanceof Error && /Connection terminated|connect ECONNREFUSED/.test(current.message)) return true;
    current = (current as { cause?: unknown }).cause;
  }
  return false;
}

interface BodyParserError {
  type?: string;
  status?: number;
  expose?: boolean;
  limit?: number;
}

export function errorHandler(logger: Logger): ErrorRequestHandler {
  return (error: unknown, req, res, next) => {
    if (res.headersSent) return next(error);
    const log = (req as { log?: Logger }).log ?? logger;

    if (error instanceof AppError) {
      return res.status(error.status).json(body(error.code, error.message, error.details));
    }
    if (error instanceof InputError) {
      const issues = error.zodError.issues.map((issue) => ({
        in: error.location,
        path: issue.path.map(String).join('.'),
        message: issue.message,
      }));
      return res.status(400).json(body('VALIDATION_FAILED', 'Some fields are not valid.', { issues }));
    }
    const parserError = error as BodyParserError;
    switch (parserError.type) {
      case 'entity.parse.failed':
        return res.status(400).json(body('MALFORMED_JSON', 'The request body is not valid JSON.'));
      case 'entity.too.large':
        return res.status(413).json(body('PAYLOAD_TOO_LARGE', 'The request body is too large.', parserError.limit ? { limitBytes: parserError.limit } : undefined));
      case 'encoding.unsupported':
      case 'charset.unsupported':
        return res.status(415).json(body('UNSUPPORTED_MEDIA_TYPE', 'The request body uses an encoding the server does not accept.'));
      default:
        break;
    }
    if (parserError.expose && typeof parserError.status === 'number' && parserError.status >= 400 && parserError.status < 500) {
      return res.status(parserError.status).json(body('BAD_REQUEST', 'The request could not be read.'));
    }
    if (isDatabaseUnavailable(error)) {
      log.error({ err: error }, 'database unavailable');
      return res.status(503).json(body('SERVICE_UNAVAILABLE', 'The database is not answering. Try again in a moment.'));
    }
    log.error({ err: error, requestId: req.id }, 'unhandled error');
    return res.status(500).json(body('INTERNAL', 'Something went wrong on the server. It has been logged.', { requestId: String(req.id ?? '') }));
  };
}

/** Unknown /api routes: a JSON 404, never the SPA's index.html. */
export const apiNotFound: RequestHandler = (_req, res) => {
  res.status(ERROR_STATUS.NOT_FOUND).json(body('NOT_FOUND' satisfies ErrorCode, 'There is nothing at this address.'));
};
