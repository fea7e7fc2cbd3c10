import type { RequestHandler } from 'express';
import jwt from 'jsonwebtoken';
import type { Role } from '../../shared/roles.js';
import { Session, User } from '../models/index.js';

export const SESSION_COOKIE = 'coretrail_session';
export const JWT_ALGORITHM = 'HS256' as const;

export type AuthedUser = {
  id: number;
  email: string;
  name: string;
  role: Role;
  sessionId: string;
};

declare module 'express-serve-static-core' {
  interface Request {
    user?: AuthedUser;
  }
}

type Claims = { sub: string; sid: string; tv: number };

/**
 * Reads the session cookie. A token counts only when its signature and expiry hold, its session
 * row is not revoked, and the user is active with the same token version (a password change or
 * deactivation bumps it, ending every session at once). Anything else is simply "signed out".
 */
export function authenticate(secret: string): RequestHandler {
  return async (req, _res, next) => {
    const token: unknown = req.cookies?.[SESSION_COOKIE];
    if (typeof token !== 'string' || !token) return next();
    let claims: Claims;
    try {
      claims = jwt.verify(token, secret, { algorithms: [JWT_ALGORITHM] }) as Claims;
    } catch {
      return next();
    }
    const session = await Session.findByPk(claims.sid);
    if (!session || session.revokedAt || session.expiresAt.getTime() <= Date.now()) return next();
    const user = await User.findByPk(session.userId);
    if (
      !user ||
      !user.active ||
      String(user.id) !== claims.sub ||
      user.tokenVersion !== session.tokenVersion ||
      user.tokenVersion !== claims.tv
    ) {
      return next();
    }
    req.user = { id: user.id, email: user.email, name: user.name, role: user.role, sessionId: session.id };
    next();
  };
}
