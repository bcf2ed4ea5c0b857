import type { RequestHandler, Request } from 'express';
import { can, type Action, type Actor, type Resource } from '@underfoot/core';
import type { UserRecord } from '../modules/auth/users.repo.ts';
import { forbidden, unauthorized } from './errors.ts';

declare global {
  // eslint-disable-next-line @typescript-eslint/no-namespace
  namespace Express {
    // passport's req.user is our user record.
    // eslint-disable-next-line @typescript-eslint/no-empty-object-type -- merging needs an interface
    interface User extends UserRecord {}
  }
}

export function actorOf(req: Request): Actor | null {
  const user = req.user;
  return user ? { kind: 'user', userId: user.id, role: user.role, companyId: user.companyId } : null;
}

export function currentUser(req: Request): UserRecord {
  if (!req.user) throw unauthorized();
  return req.user;
}

export const requireSignIn: RequestHandler = (req, _res, next) => {
  next(req.user ? undefined : unauthorized());
};

/** Guard a company-wide action (no order involved) with core's `can`. */
export function requireCompanyPermission(action: Action): RequestHandler {
  return (req, _res, next) => {
    const user = req.user;
    if (!user) return next(unauthorized());
    const resource: Resource = { companyId: user.companyId };
    next(can(actorOf(req), action, resource) ? undefined : forbidden());
  };
}
