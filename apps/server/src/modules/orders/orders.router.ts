import { Router } from 'express';
import { z } from 'zod';
import { cancelOrderSchema, makeOrderCreateSchema, makeScheduleSchema, orderStatuses, todayIso } from '@underfoot/core';
import type { Knex } from 'knex';
import { currentUser, requireSignIn } from '../../http/auth-guards.ts';
import { forbidden, parseInput } from '../../http/errors.ts';
import { listActiveFeeItems } from '../fees/fees.repo.ts';
import type { OrdersService } from './orders.service.ts';

const listQuerySchema = z.object({
  status: z
    .union([z.enum(orderStatuses), z.array(z.enum(orderStatuses))])
    .optional()
    .transform((s) => (s === undefined ? undefined : Array.isArray(s) ? s : [s])),
  q: z.string().trim().max(100).optional(),
  sort: z.enum(['attention', 'deadline', 'created', 'status', 'address', 'window']).default('attention'),
  direction: z.enum(['asc', 'desc']).default('asc'),
  limit: z.coerce.number().int().min(1).max(200).default(50),
  offset: z.coerce.number().int().min(0).default(0),
});

const jobsQuerySchema = z.object({ date: z.iso.date({ error: 'Use a date like 2027-03-14.' }).optional() });

async function companyToday(db: Knex, companyId: string) {
  const company = await db('companies').where({ id: companyId }).first('time_zone');
  return todayIso(new Date(), company?.time_zone ?? 'UTC');
}

export function ordersRouter(db: Knex, orders: OrdersService): Router {
  const router = Router();

  router.get('/fee-list', requireSignIn, async (req, res) => {
    res.json({ items: await listActiveFeeItems(db, currentUser(req).companyId) });
  });

  router.get('/orders', requireSignIn, async (req, res) => {
    const query = parseInput(listQuerySchema, req.query);
    res.json(await orders.list(currentUser(req), { ...query, statuses: query.status, search: query.q }));
  });

  router.post('/orders', requireSignIn, async (req, res) => {
    const user = currentUser(req);
    const input = parseInput(makeOrderCreateSchema(await companyToday(db, user.companyId)), req.body);
    const confirmDuplicate = (req.body as { confirmDuplicate?: unknown }).confirmDuplicate === true;
    res.status(201).json({ order: await orders.createOrder(user, input, { confirmDuplicate, ip: req.ip }) });
  });

  router.get('/orders/:id', requireSignIn, async (req, res) => {
    res.json({ order: await orders.getOrder(currentUser(req), String(req.params.id)) });
  });

  router.post('/orders/:id/schedule', requireSignIn, async (req, res) => {
    const user = currentUser(req);
    const input = parseInput(makeScheduleSchema(await companyToday(db, user.companyId)), req.body);
    res.json({ order: await orders.schedule(user, String(req.params.id), input, req.ip) });
  });

  router.post('/orders/:id/cancel', requireSignIn, async (req, res) => {
    const { reason } = parseInput(cancelOrderSchema, req.body);
    res.json({ order: await orders.cancel(currentUser(req), String(req.params.id), reason, req.ip) });
  });

  router.post('/orders/:id/recorded', requireSignIn, async (req, res) => {
    res.json({ order: await orders.markRecorded(currentUser(req), String(req.params.id), req.ip) });
  });

  router.get('/inspectors', requireSignIn, async (req, res) => {
    res.json({ inspectors: await orders.listInspectors(currentUser(req)) });
  });

  /** The inspector's day: their jobs on one date, in arrival order. */
  router.get('/field/jobs', requireSignIn, async (req, res) => {
    const user = currentUser(req);
    const { date } = parseInput(jobsQuerySchema, req.query);
    const day = date ?? (await companyToday(db, user.companyId));
    if (user.role !== 'inspector') throw forbidden('The day list is for inspectors.');
    const result = await orders.list(user, { sort: 'window', direction: 'asc', limit: 200, offset: 0, windowDate: day });
    res.json({ date: day, jobs: result.orders.filter((o) => o.status !== 'cancelled') });
  });

  return router;
}
