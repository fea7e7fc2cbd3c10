import { randomUUID } from 'node:crypto';
import type { RequestHandler } from 'express';

declare module 'express-serve-static-core' {
  interface Request {
    id: string;
  }
}

const wellFormed = /^[A-Za-z0-9._-]{8,64}$/;

/** Every request gets an id: the caller's X-Request-Id when well formed, else a new UUID. */
export const requestId: RequestHandler = (req, res, next) => {
  const given = req.get('x-request-id');
  req.id = given && wellFormed.test(given) ? given : randomUUID();
  res.setHeader('X-Request-Id', req.id);
  next();
};
