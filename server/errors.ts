import { statusOf, type ConflictReason, type ErrorCode } from '../shared/errors.js';

/**
 * Errors are values with a stable code from the one vocabulary (shared/errors.ts), which also gives
 * the status; one middleware turns them into replies.
 */
export class AppError extends Error {
  readonly status: number;
  readonly code: ErrorCode;
  readonly fields?: Record<string, string>;
  readonly extra?: Record<string, unknown>;

  constructor(code: ErrorCode, message: string, fields?: Record<string, string>, extra?: Record<string, unknown>) {
    super(message);
    this.code = code;
    this.status = statusOf(code);
    this.fields = fields;
    this.extra = extra;
  }
}

export const invalid = (message: string, fields?: Record<string, string>) => new AppError('invalid', message, fields);
export const unauthenticated = (message = 'Sign in to continue.') => new AppError('unauthenticated', message);
export const forbidden = (message = 'Your role does not allow this.') => new AppError('forbidden', message);
export const notFound = (what = 'That record') => new AppError('not_found', `${what} was not found.`);
/** A rule of the trade stops this now; `reason` names the rule where the client acts on it. */
export const conflict = (message: string, extra?: { reason?: ConflictReason } & Record<string, unknown>) =>
  new AppError('conflict', message, undefined, extra);
export const tooMany = (message: string) => new AppError('too_many', message);

/** A path parameter with a broken percent-escape: Express cannot decode it. */
export const malformedPath = () =>
  new AppError('malformed_path', 'The address is malformed: a % must be followed by valid UTF-8 in hex.', {
    path: 'A % must be followed by two hex digits that make valid UTF-8.',
  });
export const unsupportedMediaType = (message: string) => new AppError('unsupported_media_type', message);
export const crossSite = () =>
  new AppError('cross_site', 'Changes are accepted only from Coretrail’s own pages. Open Coretrail and try again.');
export const secondFactorRequired = () =>
  new AppError(
    'second_factor_required',
    'Set up your second factor first: administrators sign in with a code from an authenticator app.',
  );
