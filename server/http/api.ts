import type { Request, RequestHandler, Response, Router } from 'express';
import { z } from 'zod';
import { can, type Permission } from '../../shared/permissions.js';
import { AppError, forbidden, secondFactorRequired, tooMany, unauthenticated } from '../errors.js';
import type { Ctx } from '../audit.js';
import type { AuthedUser } from '../middleware/authenticate.js';
import { personKey, type Limits } from './limits.js';

type Method = 'get' | 'post' | 'patch' | 'put' | 'delete';

/**
 * Who may call a route: nobody signed in needed, anyone signed in, holders of a permission, or an
 * enrolled station tablet (its device cookie; a person's session is not one).
 */
export type Access = 'public' | 'signed-in' | 'tablet' | Permission;

/**
 * A route where a password is typed again: wrong ones are counted per person and, past
 * PASSWORD_LIMIT_PER_PERSON in the window, every such route answers 429 for that person.
 * `signature` for records signed with a password, `password-change` for one's own password.
 */
export type LimitName = 'signature' | 'password-change';

/** Error codes that mean "the password typed again was wrong": only these count towards the limit. */
export const WRONG_PASSWORD_CODES = new Set(['signature_refused', 'wrong_password']);

type Schema = z.ZodType;
type Out<S> = S extends z.ZodType ? z.output<S> : undefined;

export type Valid<P, Q, B> = { params: Out<P>; query: Out<Q>; body: Out<B> };

export type RouteSpec<P extends Schema | undefined, Q extends Schema | undefined, B extends Schema | undefined> = {
  method: Method;
  path: string;
  access: Access;
  summary: string;
  params?: P;
  query?: Q;
  body?: B;
  status?: number;
  /** Runs after authorization and before validation, e.g. a multipart parser. */
  before?: RequestHandler;
  /** Takes a multipart upload (the only non-JSON body any route accepts). */
  file?: boolean;
  limit?: LimitName;
  /** Open to a session that may only enrol a second factor (an admin's first sign-in). */
  enrolment?: boolean;
  handler: (
    input: Valid<P, Q, B> & { user: AuthedUser | null; ctx: Ctx; req: Request; res: Response },
  ) => Promise<unknown>;
};

export type RouteInfo = {
  method: Method;
  path: string;
  access: Access;
  summary: string;
  /** The route's input schemas, for the fuzz suite to generate near-valid input from. */
  input: { params?: Schema; query?: Schema; body?: Schema; multipart?: boolean };
  limit?: LimitName;
};

/** Runs an Express middleware (a multipart parser, a rate limiter) inside an async handler. */
export function runMiddleware(mw: RequestHandler, req: Request, res: Response): Promise<void> {
  return new Promise<void>((resolve, reject) => mw(req, res, (e?: unknown) => (e ? reject(e) : resolve())));
}

// a route without a query or body schema takes none: unknown keys are refused, as everywhere else
const NOTHING = z.strictObject({});

/**
 * Each endpoint reads as a chain: authenticate (done app-wide) → authorize against the permission
 * matrix → validate params, query and body with zod → limit → handler → JSON. Every route defined
 * here is also listed in `routes`, which the authorization matrix test, the fuzz suite and the
 * docs/api.md check walk.
 */
export class Api {
  readonly routes: RouteInfo[] = [];
  constructor(
    private readonly router: Router,
    readonly limits: Limits,
  ) {}

  /** Whether a multipart body may be sent to this method and path (checked before any route runs). */
  takesFile = (method: string, path: string): boolean =>
    this.routes.some(
      (r) =>
        r.input.multipart &&
        r.method === method.toLowerCase() &&
        new RegExp(`^${r.path.replace(/^\/api/, '').replace(/:[a-zA-Z]+/g, '[^/]+')}$`).test(path),
    );

  define<P extends Schema | undefined, Q extends Schema | undefined, B extends Schema | undefined>(
    spec: RouteSpec<P, Q, B>,
  ): void {
    this.routes.push({
      method: spec.method,
      path: `/api${spec.path}`,
      access: spec.access,
      summary: spec.summary,
      input: { params: spec.params, query: spec.query, body: spec.body, multipart: spec.file === true },
      limit: spec.limit,
    });
    const limiter = this.limits.password;
    const limitMessage = `Too many wrong passwords. Wait ${this.limits.windowMin} minutes, then try again, or ask an administrator to lift the lock.`;
    const handler: RequestHandler = async (req: Request, res: Response) => {
      const user = req.user ?? null;
      if (spec.access === 'tablet') {
        if (!req.tablet)
          throw unauthenticated('This device is not an enrolled station tablet: an administrator enrols it.');
      } else if (spec.access !== 'public') {
        if (!user) throw unauthenticated();
        if (user.enrolOnly && !spec.enrolment) throw secondFactorRequired();
        if (spec.access !== 'signed-in' && !can(user.role, spec.access)) throw forbidden();
      }
      if (spec.before) await runMiddleware(spec.before, req, res);
      const params = spec.params ? spec.params.parse(req.params) : undefined;
      const query = (spec.query ?? NOTHING).parse(req.query);
      const body = spec.file ? undefined : (spec.body ?? NOTHING).parse(req.body ?? {});
      const ctx: Ctx = { actor: user ? { id: user.id, role: user.role, name: user.name } : null, requestId: req.id };
      const key = spec.limit && user ? personKey(user.id) : null;
      if (key && limiter.lockedFor(key)) throw tooMany(limitMessage);
      let result: unknown;
      try {
        result = await spec.handler({
          params: params as Out<P>,
          query: (spec.query ? query : undefined) as Out<Q>,
          body: (spec.body ? body : undefined) as Out<B>,
          user,
          ctx,
          req,
          res,
        });
      } catch (err) {
        if (key && err instanceof AppError && WRONG_PASSWORD_CODES.has(err.code)) limiter.fail(key);
        throw err;
      }
      if (res.headersSent) return;
      if (result === undefined) res.status(spec.status ?? 204).end();
      else res.status(spec.status ?? 200).json(result);
    };
    this.router[spec.method](spec.path, handler);
  }
}
