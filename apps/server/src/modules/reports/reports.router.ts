import { Router, type Response } from 'express';
import { gradeOverrideSchema } from '@underfoot/core';
import { z } from 'zod';
import { currentUser, requireSignIn } from '../../http/auth-guards.ts';
import { notFound, parseInput } from '../../http/errors.ts';
import { jsonWithParts } from '../../lib/json-parts.ts';
import type { MediaStorage } from '../../storage/media-storage.ts';
import { fileCaching, sendStoredFile } from '../media/send-stored-file.ts';
import type { ReportsService } from './reports.service.ts';

const publishSchema = z.object({
  note: z.string().trim().max(2000, 'Use at most 2,000 characters.').default(''),
  kind: z.enum(['amendment', 'reinspection']).optional(),
  /** The inspection version the reviewer looked at; a newer one is refused (409) rather than published unseen. */
  inspectionVersion: z.int().min(0).optional(),
});
const overrideSchema = z.object({
  baseVersion: z.int({ error: 'Say which version of the inspection this started from.' }).min(1),
  override: gradeOverrideSchema.nullable(),
});
const shareLinkSchema = z.object({
  purpose: z.enum(['guest', 'disclosure']).default('guest'),
  label: z.string().trim().max(120, 'Use at most 120 characters.').default(''),
  expiresInDays: z.coerce.number().int().min(1, 'At least one day.').max(365, 'At most a year.').nullable().default(null),
  showCosts: z.boolean().default(true),
});
const messageSchema = z.object({
  body: z.string().trim().min(3, 'Write your question or answer.').max(2000, 'Use at most 2,000 characters.'),
});
const revisionQuerySchema = z.object({ revision: z.coerce.number().int().min(1).optional() });
const variantSchema = z.enum(['file', 'thumbnail']);

/**
 * A report as JSON: the frozen revision and its comparison are encoded once per process, not per
 * reader. Sent as bytes with no ETag: the answer is never stored (no-store), so hashing it to
 * label it for a cache was wasted work on the busiest read.
 */
function sendReport(res: Response, report: { revision: object; changes: object | null }) {
  const { revision, changes, ...forReader } = report;
  const body = jsonWithParts(forReader, { revision, changes });
  res.set({ 'Cache-Control': 'no-store', 'Content-Type': 'application/json; charset=utf-8', 'Content-Length': String(body.length) });
  res.end(body);
}

function sendPdf(res: Response, pdf: { bytes: Buffer; fileName: string }) {
  res.set({
    'Content-Type': 'application/pdf',
    'Content-Length': String(pdf.bytes.length),
    'Content-Disposition': `attachment; filename="${pdf.fileName}"`,
    'Cache-Control': 'no-store',
  });
  res.end(pdf.bytes);
}

export function reportsRouter(reports: ReportsService, storage: MediaStorage): Router {
  const router = Router();
  const id = (v: unknown) => String(v);

  // Review and publish (the office, or an inspector the company allows).
  router.get('/orders/:id/review', requireSignIn, async (req, res) => {
    res.set('Cache-Control', 'no-store').json(await reports.review(currentUser(req), id(req.params.id)));
  });
  router.post('/orders/:id/grade-override', requireSignIn, async (req, res) => {
    const input = parseInput(overrideSchema, req.body);
    res.json(await reports.setGradeOverride(currentUser(req), id(req.params.id), input, req.ip));
  });
  router.post('/orders/:id/publish', requireSignIn, async (req, res) => {
    const input = parseInput(publishSchema, req.body);
    res.status(201).json(await reports.publish(currentUser(req), id(req.params.id), input, req.ip));
  });
  router.post('/orders/:id/reopen', requireSignIn, async (req, res) => {
    await reports.reopen(currentUser(req), id(req.params.id), req.ip);
    res.status(204).end();
  });

  // Reading, for signed-in readers.
  router.get('/reports/:id', requireSignIn, async (req, res) => {
    const { revision } = parseInput(revisionQuerySchema, req.query);
    sendReport(res, await reports.read(currentUser(req), id(req.params.id), { revision, ip: req.ip }));
  });
  router.get('/reports/:id/pdf', requireSignIn, async (req, res) => {
    const { revision } = parseInput(revisionQuerySchema, req.query);
    sendPdf(res, await reports.pdf(currentUser(req), id(req.params.id), { revision, ip: req.ip }));
  });
  router.post('/reports/:id/disclose', requireSignIn, async (req, res) => {
    res.json(await reports.setDisclosure(currentUser(req), id(req.params.id), true, req.ip));
  });
  router.post('/reports/:id/withdraw-disclosure', requireSignIn, async (req, res) => {
    res.json(await reports.setDisclosure(currentUser(req), id(req.params.id), false, req.ip));
  });
  router.get('/reports/:id/share-links', requireSignIn, async (req, res) => {
    res.set('Cache-Control', 'no-store').json({ links: await reports.listShareLinks(currentUser(req), id(req.params.id)) });
  });
  router.post('/reports/:id/share-links', requireSignIn, async (req, res) => {
    const input = parseInput(shareLinkSchema, req.body);
    res.status(201).json(await reports.createShareLink(currentUser(req), id(req.params.id), input, req.ip));
  });
  router.post('/reports/:id/share-links/:linkId/revoke', requireSignIn, async (req, res) => {
    await reports.revokeShareLink(currentUser(req), id(req.params.id), id(req.params.linkId), req.ip);
    res.status(204).end();
  });
  router.get('/reports/:id/views', requireSignIn, async (req, res) => {
    res.set('Cache-Control', 'no-store').json({ views: await reports.views(currentUser(req), id(req.params.id)) });
  });
  router.get('/reports/:id/questions', requireSignIn, async (req, res) => {
    res.set('Cache-Control', 'no-store').json({ questions: await reports.questions(currentUser(req), id(req.params.id)) });
  });
  router.post('/reports/:id/questions', requireSignIn, async (req, res) => {
    const { body } = parseInput(messageSchema, req.body);
    res.status(201).json(await reports.ask(currentUser(req), id(req.params.id), body));
  });
  router.post('/reports/:id/questions/:questionId/answers', requireSignIn, async (req, res) => {
    const { body } = parseInput(messageSchema, req.body);
    res.status(201).json(await reports.answer(currentUser(req), id(req.params.id), id(req.params.questionId), body));
  });

  // Guests: no session needed; the token is the permission, and a link that does not work is one 404.
  router.get('/shared/:token', async (req, res) => {
    sendReport(res, await reports.readShared(id(req.params.token), { ip: req.ip }));
  });
  router.get('/shared/:token/pdf', async (req, res) => {
    sendPdf(res, await reports.sharedPdf(id(req.params.token), { ip: req.ip }));
  });
  router.get('/shared/:token/media/:mediaId/:variant', async (req, res) => {
    const variant = variantSchema.safeParse(req.params.variant);
    if (!variant.success) throw notFound('file');
    const file = await reports.sharedMediaFile(id(req.params.token), id(req.params.mediaId), variant.data);
    await sendStoredFile(req, res, storage, file, fileCaching.guest);
  });
  return router;
}
