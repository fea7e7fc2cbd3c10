import { createSecretKey } from 'node:crypto';
import type { RequestHandler } from 'express';
import jwt from 'jsonwebtoken';
import { QueryTypes } from 'sequelize';
import { FLOOR_ROLES, type Role } from '../../shared/roles.js';
import { Session } from '../models/index.js';

export const SESSION_COOKIE = 'coretrail_session';
export const JWT_ALGORITHM = 'HS256' as const;

export type AuthedUser = {
  id: number;
  email: string;
  name: string;
  role: Role;
  sessionId: string;
  /** An admin signed in without a second factor: only enrolment is open to this session. */
  enrolOnly: boolean;
};

/** How long a session may sit unused: a shift on the floor, IDLE_TIMEOUT_MIN in the office. */
export const idleLimitMs = (role: Role, o: { idleMin: number; shiftHours: number }) =>
  FLOOR_ROLES.includes(role) ? o.shiftHours * 3600_000 : o.idleMin * 60_000;

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
export function authenticate(
  secret: string,
  idle: { idleMin: number; shiftHours: number } = { idleMin: 30, shiftHours: 8 },
): RequestHandler {
  // made once: jsonwebtoken would otherwise build a key object from the string on every request
  const key = createSecretKey(Buffer.from(secret, 'utf8'));
  return async (req, _res, next) => {
    const token: unknown = req.cookies?.[SESSION_COOKIE];
    if (typeof token !== 'string' || !token) return next();
    let claims: Claims;
    try {
      claims = jwt.verify(token, key, { algorithms: [JWT_ALGORITHM] }) as Claims;
    } catch {
      return next();
    }
    // the session and its user in one round trip: every request pays for this
    const [row] = await Session.sequelize!.query<{
      session_id: string;
      revoked_at: Date | null;
      expires_at: Date;
      session_tv: number;
      last_seen_at: Date;
      stale: boolean;
      enrol_only: boolean;
      id: number;
      email: string;
      name: string;
      role: Role;
      active: boolean;
      user_tv: number;
    }>(
      `SELECT s.id AS session_id, s.revoked_at, s.expires_at, s.token_version AS session_tv, s.last_seen_at,
              s.last_seen_at < now() - interval '1 minute' AS stale, s.enrol_only,
              u.id, u.email, u.name, u.role, u.active, u.token_version AS user_tv
         FROM sessions s JOIN users u ON u.id = s.user_id WHERE s.id = :sid`,
      { type: QueryTypes.SELECT, replacements: { sid: claims.sid } },
    );
    if (!row || row.revoked_at || new Date(row.expires_at).getTime() <= Date.now()) return next();
    if (!row.active || String(row.id) !== claims.sub || row.user_tv !== row.session_tv || row.user_tv !== claims.tv) {
      return next();
    }
    if (Date.now() - new Date(row.last_seen_at).getTime() > idleLimitMs(row.role, idle)) return next();
    // at most one write a minute per session keeps "last seen" close enough for the idle limit
    if (row.stale) {
      await Session.sequelize!.query('UPDATE sessions SET last_seen_at = now() WHERE id = :sid', {
        replacements: { sid: row.session_id },
      });
    }
    req.user = {
      id: row.id,
      email: row.email,
      name: row.name,
      role: row.role,
      sessionId: row.session_id,
      enrolOnly: row.enrol_only,
    };
    next();
  };
}
