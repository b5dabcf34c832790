import { randomUUID } from 'node:crypto';
import type { ErrorRequestHandler, RequestHandler } from 'express';
import { ZodError } from 'zod';

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
export function errorHandler(opts: { exposeStack: boolean; log?: (msg: string, err: unknown) => void }): ErrorRequestHandler {
  return (err, req, res, _next) => {
    const requestId = res.locals.requestId as string | undefined;
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
      const message = err.type === 'entity.too.large' ? 'The request body is too large.' : err.type === 'entity.parse.failed' ? 'The request body is not valid JSON.' : String(err.message ?? 'Bad request');
      res.status(status).json({ error: err.type ?? 'bad_request', message, requestId });
      return;
    }
    (opts.log ?? ((m, e) => console.error(m, e)))(`request ${requestId} ${req.method} ${req.originalUrl} failed`, err);
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
