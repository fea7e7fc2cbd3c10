import type { CookieOptions, Request } from 'express';
import { rateLimit } from 'express-rate-limit';
import type { Sequelize } from 'sequelize';
import { permissionsOf } from '../../shared/permissions.js';
import { changePasswordBody, loginBody, type MeResponse } from '../../shared/schemas/auth.js';
import type { Config } from '../config.js';
import { tooMany } from '../errors.js';
import { runMiddleware, type Api } from '../http/api.js';
import { SESSION_COOKIE } from '../middleware/authenticate.js';
import { changeOwnPassword, signIn, signOut } from '../services/auth.js';

function cookieOptions(config: Config, req: Request): CookieOptions {
  const secure = config.SECURE_COOKIES === 'always' || (config.SECURE_COOKIES === 'auto' && req.secure);
  return { httpOnly: true, sameSite: 'lax', secure, path: '/' };
}

export function authRoutes(api: Api, sequelize: Sequelize, config: Config) {
  const windowMs = config.LOGIN_LIMIT_WINDOW_MIN * 60_000;
  const TOO_MANY = `Too many failed sign-ins. Wait ${config.LOGIN_LIMIT_WINDOW_MIN} minutes, then try again, or ask an administrator.`;
  const limited = (message: string) => () => {
    throw tooMany(message);
  };
  // only failures count, per address and per account; both answer with the same plain message
  const perAddress = rateLimit({
    windowMs,
    limit: config.LOGIN_LIMIT_PER_ADDRESS,
    skipSuccessfulRequests: true,
    standardHeaders: 'draft-8',
    legacyHeaders: false,
    handler: limited(TOO_MANY),
  });
  const perAccount = rateLimit({
    windowMs,
    limit: config.LOGIN_LIMIT_PER_ACCOUNT,
    skipSuccessfulRequests: true,
    standardHeaders: 'draft-8',
    legacyHeaders: false,
    keyGenerator: (req) => {
      const email = (req.body as { email?: unknown } | undefined)?.email;
      return `account:${typeof email === 'string' ? email.trim().toLowerCase() : ''}`;
    },
    handler: limited(TOO_MANY),
  });

  api.define({
    method: 'post',
    path: '/auth/login',
    access: 'public',
    summary: 'Sign in with e-mail and password; sets the session cookie.',
    body: loginBody,
    handler: async ({ body, req, res }) => {
      // after validation, so a malformed body does not count as a failed sign-in
      await runMiddleware(perAddress, req, res);
      await runMiddleware(perAccount, req, res);
      const { token, user, expiresAt } = await signIn(sequelize, body, {
        secret: config.JWT_SECRET,
        hours: config.SESSION_HOURS,
        ip: req.ip ?? null,
        userAgent: req.get('user-agent') ?? null,
        requestId: req.id,
      });
      res.cookie(SESSION_COOKIE, token, { ...cookieOptions(config, req), expires: expiresAt });
      const me: MeResponse = {
        user: { id: user.id, email: user.email, name: user.name, role: user.role, stationId: null },
        permissions: permissionsOf(user.role),
      };
      return me;
    },
  });

  api.define({
    method: 'post',
    path: '/auth/logout',
    access: 'signed-in',
    summary: 'Sign out: ends this session and clears the cookie.',
    handler: async ({ user, ctx, req, res }) => {
      await signOut(sequelize, ctx, user!.sessionId);
      res.clearCookie(SESSION_COOKIE, cookieOptions(config, req));
      return undefined;
    },
  });

  api.define({
    method: 'get',
    path: '/auth/me',
    access: 'signed-in',
    summary: 'The signed-in person and the permissions of their role.',
    handler: async ({ user }) => {
      const me: MeResponse = {
        user: { id: user!.id, email: user!.email, name: user!.name, role: user!.role, stationId: null },
        permissions: permissionsOf(user!.role),
      };
      return me;
    },
  });

  api.define({
    method: 'post',
    path: '/auth/password',
    access: 'account.self',
    summary: 'Change your own password; ends all your sessions, so sign in again.',
    body: changePasswordBody,
    handler: async ({ user, ctx, body, req, res }) => {
      await changeOwnPassword(sequelize, ctx, user!.id, body);
      res.clearCookie(SESSION_COOKIE, cookieOptions(config, req));
      return undefined;
    },
  });
}
