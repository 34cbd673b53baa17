/**
 * validate({ body, query, params }) parses the request with schemas from shared/schemas. A failure
 * is a ZodError tagged with where it happened, which the error handler turns into
 * 400 VALIDATION_FAILED with the field paths. Parsed values are read back with validated(req, schemas),
 * typed by the same schemas object (Express 5's req.query is read-only, so we keep them aside).
 */
import type { NextFunction, Request, RequestHandler, Response } from 'express';
import { z } from 'zod';
import './types';

export interface InputSchemas {
  body?: z.ZodType;
  query?: z.ZodType;
  params?: z.ZodType;
}

type Parsed<S extends InputSchemas> = {
  [K in keyof S]: S[K] extends z.ZodType ? z.output<S[K]> : never;
};

export type InputLocation = 'body' | 'query' | 'params';

export class InputError extends Error {
  override name = 'InputError';
  constructor(
    readonly location: InputLocation,
    readonly zodError: z.ZodError,
  ) {
    super(`Invalid ${location}`);
  }
}

export function parseInput<S extends InputSchemas>(req: Request, schemas: S): Parsed<S> {
  const out: Record<string, unknown> = {};
  for (const location of ['params', 'query', 'body'] as const) {
    const schema = schemas[location];
    if (!schema) continue;
    const result = schema.safeParse(req[location] ?? (location === 'body' ? undefined : {}));
    if (!result.success) throw new InputError(location, result.error);
    out[location] = result.data;
  }
  return out as Parsed<S>;
}

export function validate(schemas: InputSchemas): RequestHandler {
  return (req: Request, _res: Response, next: NextFunction) => {
    req.valid = { ...req.valid, ...parseInput(req, schemas) };
    next();
  };
}

/** The values validate() parsed, typed by the same schemas. */
export function validated<S extends InputSchemas>(req: Request, _schemas: S): Parsed<S> {
  if (!req.valid) throw new Error('validated() called on a route without validate()');
  return req.valid as Parsed<S>;
}
