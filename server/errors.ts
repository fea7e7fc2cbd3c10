/** Errors are values with a stable code; one middleware turns them into replies. */
export class AppError extends Error {
  constructor(
    readonly status: number,
    readonly code: string,
    message: string,
    readonly fields?: Record<string, string>,
    readonly extra?: Record<string, unknown>,
  ) {
    super(message);
  }
}

export const invalid = (message: string, fields?: Record<string, string>) =>
  new AppError(400, 'invalid', message, fields);
export const unauthenticated = (message = 'Sign in to continue.') => new AppError(401, 'unauthenticated', message);
export const forbidden = (message = 'Your role does not allow this.') => new AppError(403, 'forbidden', message);
export const notFound = (what = 'That record') => new AppError(404, 'not_found', `${what} was not found.`);
export const conflict = (message: string, extra?: Record<string, unknown>) =>
  new AppError(409, 'conflict', message, undefined, extra);
export const tooMany = (message: string) => new AppError(429, 'too_many', message);

/** A path parameter with a broken percent-escape: Express cannot decode it. */
export const malformedPath = () =>
  new AppError(400, 'malformed_path', 'The address is malformed: a % must be followed by valid UTF-8 in hex.', {
    path: 'A % must be followed by two hex digits that make valid UTF-8.',
  });
export const unsupportedMediaType = (message: string) => new AppError(415, 'unsupported_media_type', message);
export const crossSite = () =>
  new AppError(
    403,
    'cross_site',
    'Changes are accepted only from Coretrail’s own pages. Open Coretrail and try again.',
  );
export const secondFactorRequired = () =>
  new AppError(
    403,
    'second_factor_required',
    'Set up your second factor first: administrators sign in with a code from an authenticator app.',
  );
