/**
 * pino-http request logging with a request id: a sane X-Request-Id from the caller (a proxy or the
 * client) is kept, otherwise one is generated; either way it is echoed back in the response header
 * and appears on every log line of the request, including the error handler's.
 */
import { randomUUID } from 'node:crypto';
import type { IncomingMessage } from 'node:http';
import { pinoHttp } from 'pino-http';
import type { Logger } from '../lib/logger';

const REQUEST_ID_PATTERN = /^[A-Za-z0-9._:-]{1,128}$/;

export function requestIdFor(req: IncomingMessage): string {
  const given = req.headers['x-request-id'];
  const value = Array.isArray(given) ? given[0] : given;
  return value && REQUEST_ID_PATTERN.test(value) ? value : randomUUID();
}

export function requestLogger(logger: Logger) {
  return pinoHttp({
    logger,
    genReqId(req, res) {
      const id = requestIdFor(req);
      res.setHeader('X-Request-Id', id);
      return id;
    },
    customLogLevel(_req, res, error) {
      if (error || res.statusCode >= 500) return 'error';
      if (res.statusCode >= 400) return 'warn';
      return 'info';
    },
    // The body of a failed request is not logged: it may hold a password.
    serializers: {
      req: (req: { id: string; method: string; url: string }) => ({ id: req.id, method: req.method, url: req.url }),
      res: (res: { statusCode: number }) => ({ statusCode: res.statusCode }),
    },
  });
}
