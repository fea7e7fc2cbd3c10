import type { CookieOptions, Request, Response } from 'express';
import type { Sequelize } from 'sequelize';
import { permissionsOf } from '../../shared/permissions.js';
import {
  changePasswordBody,
  loginBody,
  preferencesBody,
  type MeResponse,
  type SessionResponse,
} from '../../shared/schemas/auth.js';
import type { Config } from '../config.js';
import { AppError, tooMany } from '../errors.js';
import type { Api } from '../http/api.js';
import { accountKey, type FailureLimiter } from '../http/limits.js';
import { SESSION_COOKIE, type AuthedUser } from '../middleware/authenticate.js';
import { User } from '../models/index.js';
import { changeOwnPassword, setOwnPreferences, signIn, signOut } from '../services/auth.js';
import { secondFactorRequiredFor } from '../services/second-factor.js';

export function cookieOptions(config: Config, req: Request): CookieOptions {
  const secure = config.SECURE_COOKIES === 'always' || (config.SECURE_COOKIES === 'auto' && req.secure);
  return { httpOnly: true, sameSite: 'lax', secure, path: '/' };
}

/** Who is signed in, what their role may do, and where their second factor stands. */
export async function meOf(user: Pick<AuthedUser, 'id' | 'email' | 'name' | 'role'>): Promise<MeResponse> {
  const row = await User.findByPk(user.id, { attributes: ['id', 'totpSecret', 'language', 'unitSystem'] });
  return {
    user: {
      id: user.id,
      email: user.email,
      name: user.name,
      role: user.role,
      stationId: null,
      language: row?.language ?? 'en',
      unitSystem: row?.unitSystem ?? 'inch',
    },
    permissions: permissionsOf(user.role),
    secondFactor: { enrolled: Boolean(row?.totpSecret), required: secondFactorRequiredFor(user.role) },
  };
}

// failures that count: a wrong password (or unknown account) and a wrong second-factor code
const COUNTED = new Set(['sign_in_failed', 'code_refused']);

/** IETF draft-ietf-httpapi-ratelimit-headers-08: the policy and what is left of it, for the failure limit. */
function rateLimitHeaders(res: Response, limiter: FailureLimiter, key: string) {
  const window = Math.round(limiter.windowMs / 1000);
  res.setHeader('RateLimit-Policy', `"failures";q=${limiter.limit};w=${window}`);
  res.setHeader('RateLimit', `"failures";r=${limiter.remaining(key)};t=${limiter.lockedFor(key) || window}`);
}

export function authRoutes(api: Api, sequelize: Sequelize, config: Config) {
  const { signInAccount, signInAddress } = api.limits;
  const TOO_MANY = `Too many failed sign-ins. Wait ${config.LOGIN_LIMIT_WINDOW_MIN} minutes, then try again, or ask an administrator to lift the lock.`;

  api.define({
    method: 'post',
    path: '/auth/login',
    access: 'public',
    summary: 'Sign in with e-mail, password and, when you have one, a second-factor code; sets the session cookie.',
    body: loginBody,
    handler: async ({ body, req, res }) => {
      // after validation, so a malformed body does not count as a failed sign-in; checked before and
      // counted after, so right passwords arriving together never count against the account
      const account = accountKey(body.email);
      const address = req.ip ?? 'unknown';
      rateLimitHeaders(res, signInAccount, account);
      if (signInAccount.lockedFor(account) || signInAddress.lockedFor(address)) throw tooMany(TOO_MANY);
      let out;
      try {
        out = await signIn(sequelize, body, {
          secret: config.JWT_SECRET,
          hours: config.SESSION_HOURS,
          ip: req.ip ?? null,
          userAgent: req.get('user-agent') ?? null,
          requestId: req.id,
        });
      } catch (err) {
        if (err instanceof AppError && COUNTED.has(err.code)) {
          signInAccount.fail(account);
          signInAddress.fail(address);
          rateLimitHeaders(res, signInAccount, account);
        }
        throw err;
      }
      res.cookie(SESSION_COOKIE, out.token, { ...cookieOptions(config, req), expires: out.expiresAt });
      const me: MeResponse = {
        user: {
          id: out.user.id,
          email: out.user.email,
          name: out.user.name,
          role: out.user.role,
          stationId: null,
          language: out.user.language,
          unitSystem: out.user.unitSystem,
        },
        permissions: permissionsOf(out.user.role),
        secondFactor: { enrolled: Boolean(out.user.totpSecret), required: secondFactorRequiredFor(out.user.role) },
      };
      return me;
    },
  });

  api.define({
    method: 'post',
    path: '/auth/logout',
    access: 'signed-in',
    enrolment: true,
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
    enrolment: true,
    summary: 'The signed-in person, the permissions of their role and their second factor.',
    handler: ({ user }) => meOf(user!),
  });

  api.define({
    method: 'get',
    path: '/auth/session',
    access: 'public',
    summary: 'Who is signed in: as /auth/me, or 200 with a null user when nobody is (the sign-in page asks this).',
    handler: async ({ user }) => {
      const reply: SessionResponse = user ? await meOf(user) : { user: null, permissions: [] };
      return reply;
    },
  });

  api.define({
    method: 'patch',
    path: '/auth/preferences',
    access: 'account.self',
    summary: 'Your own language (English or Spanish) and unit system (inch or metric) for the floor screens.',
    body: preferencesBody,
    handler: async ({ user, ctx, body }) => {
      await setOwnPreferences(sequelize, ctx, user!.id, body);
      return meOf(user!);
    },
  });

  api.define({
    method: 'post',
    path: '/auth/password',
    access: 'account.self',
    limit: 'password-change',
    summary: 'Change your own password; ends all your sessions, so sign in again.',
    body: changePasswordBody,
    handler: async ({ user, ctx, body, req, res }) => {
      await changeOwnPassword(sequelize, ctx, user!.id, body);
      res.clearCookie(SESSION_COOKIE, cookieOptions(config, req));
      return undefined;
    },
  });
}
