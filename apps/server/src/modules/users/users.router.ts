import { Router } from 'express';
import { invitationCreateSchema } from '@underfoot/core';
import { currentUser, requireCompanyPermission } from '../../http/auth-guards.ts';
import { parseInput } from '../../http/errors.ts';
import type { AuthService } from '../auth/auth.service.ts';

/** People in the company. The office invites; the rest of this module grows with the company screens. */
export function usersRouter(auth: AuthService): Router {
  const router = Router();

  router.post('/invitations', requireCompanyPermission('company.manage'), async (req, res) => {
    const input = parseInput(invitationCreateSchema, req.body);
    const { userId } = await auth.invite(currentUser(req), input, req.ip);
    res.status(201).json({ userId });
  });

  return router;
}
