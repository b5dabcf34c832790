import { randomUUID } from 'node:crypto';
import type { ErrorRequestHandler, RequestHandler } from 'express';
import { ZodError } from 'zod';
import { isDatabaseUnavailable } from '../db/client';
import { log } from './log';

export type FieldIssue = { path: string; message: string };

/** A domain error with an HTTP status; `issues` name fields for 400 answers. */
export class HttpError extends Error {
  constructor(
    public status: number,
    message: string,
    public issues?: FieldIssue[],
    public code?: string,
  ) {
    super(message);
  }
}

export const badRequest = (message: string, issues?: FieldIssue[]) => new HttpError(400, message, issues, 'invalid_input');
export const notFound = (what = 'Not found') => new HttpError(404, what, undefined, 'not_found');
export const conflict = (message: string) => new HttpError(409, message, undefined, 'conflict');
export const forbidden = (message: string) => new HttpError(403, message, undefined, 'forbidden');

export function zodIssues(err: ZodError): FieldIssue[] {
  return err.issues.map((i) => ({ path: i.path.map(String).join('.') || '(body)', message: i.message }));
}

export const requestId: RequestHandler = (req, res, next) => {
  const id = randomUUID();
  res.locals.requestId = id;
  res.setHeader('X-Request-Id', id);
  next();
};

/** One JSON error handler: validation ⇒ 400 with field paths, domain errors ⇒ their status, anything else ⇒ 500 with a request id. */
export function errorHandler(opts: { exposeStack: boolean }): ErrorRequestHandler {
  return (err, req, res, _next) => {
    const requestId = res.locals.requestId as string | undefined;
    if (isDatabaseUnavailable(err)) {
      // The database is down or restarting: say so (503, retry shortly) instead of a 500.
      res.setHeader('Retry-After', '5');
      res.status(503).json({ error: 'unavailable', message: 'Keelson cannot reach its database just now. Try again in a moment.', requestId });
      return;
    }
    if (err instanceof ZodError) {
      res.status(400).json({ error: 'invalid_input', message: 'Some fields are not valid.', issues: zodIssues(err), requestId });
      return;
    }
    if (err instanceof HttpError) {
      res.status(err.status).json({ error: err.code ?? 'error', message: err.message, issues: err.issues, requestId });
      return;
    }
    // body-parser and similar set a status on their errors (413 too large, 400 malformed JSON).
    const status = typeof err?.status === 'number' && err.status >= 400 && err.status < 500 ? err.status : 500;
    if (status < 500) {
      const message =
        err.type === 'entity.too.large'
          ? 'The request body is too large.'
          : err.type === 'entity.parse.failed'
            ? 'The request body is not valid JSON.'
            : err.type === 'entity.too.deep'
              ? `The request body nests objects or arrays more than ${MAX_JSON_DEPTH} levels deep.`
              : String(err.message ?? 'Bad request');
      res.status(status).json({ error: err.type ?? 'bad_request', message, requestId });
      return;
    }
    log.error({ err, requestId, method: req.method, url: req.originalUrl }, 'request failed');
    res.status(500).json({
      error: 'internal',
      message: `Something went wrong on the server. Quote request id ${requestId} when reporting it.`,
      requestId,
      ...(opts.exposeStack ? { stack: String(err?.stack ?? err) } : {}),
    });
  };
}

/** Finds strings containing a NUL character (PostgreSQL cannot store them in text) and names their paths. */
function nulPaths(v: unknown, path: string[] = [], out: string[] = []): string[] {
  if (typeof v === 'string') {
    if (v.includes('\u0000')) out.push(path.join('.') || '(body)');
  } else if (Array.isArray(v)) v.forEach((x, i) => nulPaths(x, [...path, String(i)], out));
  else if (v && typeof v === 'object') for (const [k, x] of Object.entries(v)) nulPaths(x, [...path, k], out);
  return out;
}

/** Refuses JSON bodies with NUL characters up front, naming each field. */
export const rejectNulCharacters: RequestHandler = (req, _res, next) => {
  const paths = req.body && typeof req.body === 'object' ? nulPaths(req.body) : [];
  if (paths.length) return next(badRequest('Some fields contain a NUL character.', paths.map((p) => ({ path: p, message: 'must not contain a NUL character' }))));
  next();
};

/** Deepest nesting of objects and arrays a JSON body may have (the deepest real form nests about 5). */
export const MAX_JSON_DEPTH = 32;

/**
 * Depth of the deepest object/array nesting in JSON text, counted on the raw bytes before
 * parsing (brackets inside strings do not count). Stops counting past `limit`.
 */
export function jsonDepth(buf: Buffer, limit = Infinity): number {
  let depth = 0;
  let max = 0;
  let inString = false;
  for (let i = 0; i < buf.length; i++) {
    const c = buf[i];
    if (inString) {
      if (c === 0x5c) i++; // backslash: skip the escaped character
      else if (c === 0x22) inString = false;
    } else if (c === 0x22) inString = true;
    else if (c === 0x7b || c === 0x5b) {
      if (++depth > max) {
        max = depth;
        if (max > limit) return max;
      }
    } else if (c === 0x7d || c === 0x5d) depth--;
  }
  return max;
}

/**
 * For express.json's `verify`: refuses a body nested deeper than MAX_JSON_DEPTH before it is
 * parsed (a deeply nested body would otherwise exhaust the stack of every recursive walk).
 */
export function refuseDeepJson(_req: unknown, _res: unknown, buf: Buffer): void {
  if (jsonDepth(buf, MAX_JSON_DEPTH) > MAX_JSON_DEPTH) throw Object.assign(new Error('too deep'), { status: 400, type: 'entity.too.deep' });
}

/** API answers are personal and change: never stored by browsers or proxies. */
export const noStore: RequestHandler = (_req, res, next) => {
  res.setHeader('Cache-Control', 'no-store');
  next();
};
