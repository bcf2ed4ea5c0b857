import { Router } from 'express';
import { invitationCreateSchema, peopleQuerySchema, roleChangeSchema } from '@underfoot/core';
import { currentUser, requireCompanyPermission } from '../../http/auth-guards.ts';
import { parseInput } from '../../http/errors.ts';
import type { AuthService } from '../auth/auth.service.ts';
import type { PeopleService } from './people.service.ts';

const manage = requireCompanyPermission('company.manage');

/** People in the company, managed by the office (PRODUCT.md §10: "users: office"). */
export function usersRouter(auth: AuthService, people: PeopleService): Router {
  const router = Router();

  router.get('/', manage, async (req, res) => {
    const filter = parseInput(peopleQuerySchema, req.query);
    res.json({ people: await people.list(currentUser(req), filter) });
  });

  router.post('/invitations', manage, async (req, res) => {
    const input = parseInput(invitationCreateSchema, req.body);
    const { userId } = await auth.invite(currentUser(req), input, req.ip);
    res.status(201).json({ userId });
  });

  router.post('/:id/invitation', manage, async (req, res) => {
    res.json({ person: await people.resendInvitation(currentUser(req), String(req.params.id), req.ip) });
  });

  router.put('/:id/role', manage, async (req, res) => {
    const { role } = parseInput(roleChangeSchema, req.body);
    res.json({ person: await people.changeRole(currentUser(req), String(req.params.id), role, req.ip) });
  });

  router.post('/:id/disable', manage, async (req, res) => {
    res.json({ person: await people.disable(currentUser(req), String(req.params.id), req.ip) });
  });

  router.post('/:id/enable', manage, async (req, res) => {
    res.json({ person: await people.enable(currentUser(req), String(req.params.id), req.ip) });
  });

  return router;
}
