import type { Request, RequestHandler, Response, Router } from 'express';
import type { z } from 'zod';
import { can, type Permission } from '../../shared/permissions.js';
import { forbidden, unauthenticated } from '../errors.js';
import type { Ctx } from '../audit.js';
import type { AuthedUser } from '../middleware/authenticate.js';

type Method = 'get' | 'post' | 'patch' | 'put' | 'delete';

/** Who may call a route: nobody signed in needed, anyone signed in, or holders of a permission. */
export type Access = 'public' | 'signed-in' | Permission;

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
};

/** Runs an Express middleware (a multipart parser, a rate limiter) inside an async handler. */
export function runMiddleware(mw: RequestHandler, req: Request, res: Response): Promise<void> {
  return new Promise<void>((resolve, reject) => mw(req, res, (e?: unknown) => (e ? reject(e) : resolve())));
}

/**
 * Each endpoint reads as a chain: authenticate (done app-wide) → authorize against the permission
 * matrix → validate params, query and body with zod → handler → JSON. Every route defined here is
 * also listed in `routes`, which the authorization matrix test and docs/api.md check walk.
 */
export class Api {
  readonly routes: RouteInfo[] = [];
  constructor(private readonly router: Router) {}

  define<P extends Schema | undefined, Q extends Schema | undefined, B extends Schema | undefined>(
    spec: RouteSpec<P, Q, B>,
  ): void {
    this.routes.push({
      method: spec.method,
      path: `/api${spec.path}`,
      access: spec.access,
      summary: spec.summary,
      input: { params: spec.params, query: spec.query, body: spec.body, multipart: spec.before !== undefined },
    });
    const handler: RequestHandler = async (req: Request, res: Response) => {
      const user = req.user ?? null;
      if (spec.access !== 'public') {
        if (!user) throw unauthenticated();
        if (spec.access !== 'signed-in' && !can(user.role, spec.access)) throw forbidden();
      }
      if (spec.before) await runMiddleware(spec.before, req, res);
      const params = spec.params ? spec.params.parse(req.params) : undefined;
      const query = spec.query ? spec.query.parse(req.query) : undefined;
      const body = spec.body ? spec.body.parse(req.body ?? {}) : undefined;
      const ctx: Ctx = { actor: user ? { id: user.id, role: user.role, name: user.name } : null, requestId: req.id };
      const result = await spec.handler({
        params: params as Out<P>,
        query: query as Out<Q>,
        body: body as Out<B>,
        user,
        ctx,
        req,
        res,
      });
      if (res.headersSent) return;
      if (result === undefined) res.status(spec.status ?? 204).end();
      else res.status(spec.status ?? 200).json(result);
    };
    this.router[spec.method](spec.path, handler);
  }
}
