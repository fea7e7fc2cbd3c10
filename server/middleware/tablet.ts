import { createSecretKey } from 'node:crypto';
import type { RequestHandler } from 'express';
import jwt from 'jsonwebtoken';
import { QueryTypes } from 'sequelize';
import { StationTablet } from '../models/index.js';
import { JWT_ALGORITHM } from './authenticate.js';

export const TABLET_COOKIE = 'coretrail_tablet';
/** An enrolled tablet keeps its sign-in for a year, or until an admin retires it. */
export const TABLET_DAYS = 365;

export type AuthedTablet = {
  id: number;
  label: string;
  station: { id: number; code: string; name: string; location: string; stageId: number | null };
};

declare module 'express-serve-static-core' {
  interface Request {
    tablet?: AuthedTablet;
  }
}

type Claims = { sub: string; typ: string };

export function signTabletToken(secret: string, tabletId: number): string {
  return jwt.sign({ typ: 'tablet' }, secret, {
    algorithm: JWT_ALGORITHM,
    subject: String(tabletId),
    expiresIn: `${TABLET_DAYS}d`,
  });
}

/**
 * Reads the tablet cookie beside the person's session. It counts only with a valid signature and
 * expiry, the `tablet` type (a person's session token is not one), and a tablet row not retired
 * whose station is in service. Anything else is simply "no tablet".
 */
export function authenticateTablet(secret: string): RequestHandler {
  const key = createSecretKey(Buffer.from(secret, 'utf8'));
  return async (req, _res, next) => {
    const token: unknown = req.cookies?.[TABLET_COOKIE];
    if (typeof token !== 'string' || !token) return next();
    let claims: Claims;
    try {
      claims = jwt.verify(token, key, { algorithms: [JWT_ALGORITHM] }) as Claims;
    } catch {
      return next();
    }
    const id = Number(claims.sub);
    if (claims.typ !== 'tablet' || !Number.isSafeInteger(id) || id <= 0 || id > 2_147_483_647) return next();
    const [row] = await StationTablet.sequelize!.query<{
      id: number;
      label: string;
      station_id: number;
      code: string;
      name: string;
      location: string;
      stage_id: number | null;
    }>(
      `SELECT t.id, t.label, s.id AS station_id, s.code, s.name, s.location, s.stage_id
         FROM station_tablets t JOIN stations s ON s.id = t.station_id
        WHERE t.id = :id AND t.retired_at IS NULL AND s.active`,
      { type: QueryTypes.SELECT, replacements: { id } },
    );
    if (row) {
      req.tablet = {
        id: row.id,
        label: row.label,
        station: { id: row.station_id, code: row.code, name: row.name, location: row.location, stageId: row.stage_id },
      };
    }
    next();
  };
}
