import type { ErrorRequestHandler } from 'express';
import {
  ForeignKeyConstraintError,
  UniqueConstraintError,
  ValidationError as SequelizeValidationError,
} from 'sequelize';
import { MulterError } from 'multer';
import { ZodError } from 'zod';
import { isDatabaseUnreachable } from '../db.js';
import type { ErrorCode } from '../../shared/errors.js';
import { AppError, malformedPath } from '../errors.js';

/** Plain names for the unique columns a person can clash with. */
const FIELD_NAMES: Record<string, string> = { email: 'e-mail address', code: 'code', serial: 'serial' };
const camel = (s: string) => s.replace(/_([a-z])/g, (_m, c: string) => c.toUpperCase());

type Reply = {
  status: number;
  code: ErrorCode;
  message: string;
  fields?: Record<string, string>;
  extra?: object;
  retryAfter?: number;
};

/** Seconds a client waits before it tries again: a restart of PostgreSQL takes a few. */
export const UNAVAILABLE_RETRY_AFTER = 2;

function fromZod(err: ZodError): Reply {
  const fields: Record<string, string> = {};
  for (const issue of err.issues) {
    if (issue.code === 'unrecognized_keys') {
      for (const k of issue.keys) fields[[...issue.path, k].join('.')] = 'This field is not allowed.';
      continue;
    }
    // the first problem of each field is the one to show
    fields[issue.path.join('.') || '(body)'] ??= issue.message;
  }
  return { status: 400, code: 'invalid', message: 'Some fields need attention.', fields };
}

function classify(err: unknown): Reply {
  // the router's decoding of a path parameter: a stray % or bytes that are not UTF-8
  if (err instanceof URIError) err = malformedPath();
  if (err instanceof AppError) {
    return { status: err.status, code: err.code, message: err.message, fields: err.fields, extra: err.extra };
  }
  if (err instanceof ZodError) return fromZod(err);
  // before the other database errors: a lost connection can surface as any Sequelize error class (DatabaseError
  // wrapping 57P01, a failed COMMIT, a pool that cannot hand out a connection)
  if (isDatabaseUnreachable(err)) {
    return {
      status: 503,
      code: 'unavailable',
      message: 'The database is not reachable right now. Try again shortly.',
      retryAfter: UNAVAILABLE_RETRY_AFTER,
    };
  }
  if (err instanceof MulterError) {
    if (err.code === 'LIMIT_FILE_SIZE') {
      return { status: 413, code: 'too_large', message: 'The file is larger than the 8 MB a photo may be.' };
    }
    return { status: 400, code: 'invalid_upload', message: 'Send one photo in the form field "file".' };
  }
  const e = err as { type?: string; status?: number; expose?: boolean };
  if (e?.type === 'entity.parse.failed') {
    return { status: 400, code: 'malformed_json', message: 'The request body is not valid JSON.' };
  }
  if (e?.type === 'entity.too.large') {
    return { status: 413, code: 'too_large', message: 'The request body is too large.' };
  }
  if (e?.type === 'encoding.unsupported' || e?.type === 'charset.unsupported') {
    return { status: 415, code: 'unsupported_media_type', message: 'Send the body as UTF-8 JSON.' };
  }
  if (err instanceof UniqueConstraintError) {
    const fields: Record<string, string> = {};
    const names: string[] = [];
    for (const item of err.errors) {
      if (!item.path) continue;
      const name = FIELD_NAMES[item.path] ?? item.path.replace(/_/g, ' ');
      names.push(name);
      fields[camel(item.path)] = `Another record already has this ${name}.`;
    }
    const what = names.length ? `this ${names.join(' and ')}` : 'that value';
    return {
      status: 409,
      code: 'duplicate',
      message: `Another record already has ${what}: choose a different one.`,
      fields,
    };
  }
  if (err instanceof ForeignKeyConstraintError) {
    return { status: 409, code: 'reference', message: 'That record refers to, or is referred to by, another record.' };
  }
  if (err instanceof SequelizeValidationError) {
    return { status: 400, code: 'invalid', message: err.message };
  }
  if (e?.expose && typeof e.status === 'number' && e.status < 500) {
    return { status: e.status, code: 'bad_request', message: String((err as Error).message) };
  }
  return {
    status: 500,
    code: 'internal',
    message: 'Something went wrong on our side. The request id identifies it in the log.',
  };
}

/** The driver's own words, under Sequelize's wrapper. */
function describe(err: unknown): string {
  const e = err as { message?: string; parent?: { message?: string; code?: string } };
  const inner = e?.parent?.message && e.parent.message !== e.message ? ` (${e.parent.message})` : '';
  const code = e?.parent?.code ? ` [${e.parent.code}]` : '';
  return `${e?.message ?? String(err)}${inner}${code}`;
}

/** One place maps every error to `{ error: { code, message, fields?, requestId } }`. */
export const errorHandler: ErrorRequestHandler = (err, req, res, next) => {
  if (res.headersSent) return next(err);
  const reply = classify(err);
  if (reply.code === 'unavailable') {
    // one line each: while the database is away every request in flight lands here
    console.error(`[${req.id}] ${req.method} ${req.originalUrl}: 503, database unreachable: ${describe(err)}`);
  } else if (reply.status >= 500) {
    console.error(`[${req.id}] ${req.method} ${req.originalUrl}:`, err);
  }
  // a handler may have said it was sending a file before it failed: the reply is JSON all the same
  res.removeHeader('Content-Disposition');
  res.setHeader('Content-Type', 'application/json; charset=utf-8');
  if (reply.retryAfter) res.setHeader('Retry-After', String(reply.retryAfter));
  res.status(reply.status).json({
    error: { code: reply.code, message: reply.message, fields: reply.fields, requestId: req.id, ...reply.extra },
  });
};
