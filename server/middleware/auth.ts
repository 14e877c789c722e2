import type { Request, RequestHandler } from 'express';
import type { Role } from '../../shared/schemas/enums.js';
import type { SessionUser } from '../../shared/schemas/auth.js';
import { AppError } from '../lib/errors.js';

export function currentUser(req: Request): SessionUser {
  const user = req.user as SessionUser | undefined;
  if (!user) throw new AppError('UNAUTHENTICATED', 401, 'Sign in first');
  return user;
}

export const requireAuth: RequestHandler = (req, _res, next) => {
  currentUser(req);
  next();
};

/** Lets the request through only for the given roles (and answers 401 when signed out). */
export function requireRole(...roles: readonly Role[]): RequestHandler {
  return (req, _res, next) => {
    const user = currentUser(req);
    if (!roles.includes(user.role)) throw AppError.forbidden();
    next();
  };
}
