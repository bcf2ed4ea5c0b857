import { Router, type RequestHandler } from 'express';
import {
  auditQuerySchema,
  can,
  companyProfileSchema,
  companySettingsPatchSchema,
  feeItemSchema,
  feeOrderSchema,
  priceBookSchema,
} from '@underfoot/core';
import { actorOf, currentUser, requireCompanyPermission, requireSignIn } from '../../http/auth-guards.ts';
import { forbidden, HttpError, parseInput, unauthorized } from '../../http/errors.ts';
import { singleFileUpload } from '../media/upload.ts';
import type { CompanyService } from './company.service.ts';
import { MAX_LOGO_BYTES } from './logo-image.ts';

const manage = requireCompanyPermission('company.manage');

/**
 * Reading the price book: the office, which edits it (PRODUCT.md §10 "price book: office"), and
 * inspectors, whose phones preview cost ranges with it while recording (PRODUCT.md §5: the core
 * runs in the browser). Agents and clients only ever see the ranges inside a released report.
 */
const readPriceBook: RequestHandler = (req, _res, next) => {
  const user = req.user;
  if (!user) return next(unauthorized());
  const allowed = can(actorOf(req), 'company.manage', { companyId: user.companyId }) || user.role === 'inspector';
  next(allowed ? undefined : forbidden());
};

// A logo is small: held in memory, one file, no other fields. It is received like every upload (the one
// place that checks file names and turns a broken or cut-off form into a 4xx problem rather than a 500).
const receiveLogo = singleFileUpload({ field: 'logo', maxBytes: MAX_LOGO_BYTES, what: 'logo', fields: 0 });

export function companyRouter(company: CompanyService): Router {
  const router = Router();

  router.get('/company', manage, async (req, res) => {
    res.json({ company: await company.view(currentUser(req)) });
  });

  router.get('/company/brand', requireSignIn, async (req, res) => {
    res.json({ brand: await company.brand(currentUser(req).companyId) });
  });

  router.put('/company/profile', manage, async (req, res) => {
    const profile = parseInput(companyProfileSchema, req.body);
    res.json({ company: await company.updateProfile(currentUser(req), profile, req.ip) });
  });

  router.patch('/company/settings', manage, async (req, res) => {
    const patch = parseInput(companySettingsPatchSchema, req.body);
    res.json({ company: await company.updateSettings(currentUser(req), patch, req.ip) });
  });

  router.post('/company/logo', manage, receiveLogo, async (req, res) => {
    if (!req.file) throw new HttpError(400, 'no_file', 'Choose a picture file for the logo.');
    res.status(201).json({ company: await company.setLogo(currentUser(req), req.file.buffer, req.ip) });
  });

  router.delete('/company/logo', manage, async (req, res) => {
    res.json({ company: await company.removeLogo(currentUser(req), req.ip) });
  });

  // ---------- fee list ----------

  router.get('/company/fees', manage, async (req, res) => {
    res.json({ items: await company.listFees(currentUser(req)) });
  });

  router.post('/company/fees', manage, async (req, res) => {
    const item = parseInput(feeItemSchema, req.body);
    res.status(201).json({ item: await company.createFee(currentUser(req), item, req.ip) });
  });

  // Before '/company/fees/:id', which would otherwise take "order" for an id.
  router.put('/company/fees/order', manage, async (req, res) => {
    const { ids } = parseInput(feeOrderSchema, req.body);
    res.json({ items: await company.reorderFees(currentUser(req), ids, req.ip) });
  });

  router.put('/company/fees/:id', manage, async (req, res) => {
    const item = parseInput(feeItemSchema, req.body);
    res.json({ item: await company.updateFee(currentUser(req), String(req.params.id), item, req.ip) });
  });

  // ---------- price book ----------

  router.get('/company/price-book', readPriceBook, async (req, res) => {
    res.json(await company.priceBook(currentUser(req)));
  });

  router.put('/company/price-book', manage, async (req, res) => {
    const book = parseInput(priceBookSchema, req.body);
    res.json(await company.savePrices(currentUser(req), book, req.ip));
  });

  // ---------- audit trail ----------

  router.get('/company/audit', manage, async (req, res) => {
    const query = parseInput(auditQuerySchema, req.query);
    res.json(await company.auditPage(currentUser(req), query));
  });

  router.get('/company/audit/filters', manage, async (req, res) => {
    res.json(await company.auditFilters(currentUser(req)));
  });

  router.get('/company/audit/export', manage, async (req, res) => {
    const { page: _page, pageSize: _pageSize, ...filter } = parseInput(auditQuerySchema, req.query);
    const { csv } = await company.auditCsv(currentUser(req), filter, req.ip);
    const day = new Date().toISOString().slice(0, 10);
    res
      .status(200)
      .type('text/csv; charset=utf-8')
      .set('Content-Disposition', `attachment; filename="audit-trail-${day}.csv"`)
      .set('Cache-Control', 'no-store')
      .send(csv);
  });

  return router;
}

/** Logos are public by their unguessable id: they appear in e-mails and on the public report pages. */
export function companyLogoRouter(company: CompanyService): Router {
  const router = Router();
  router.get('/:file', async (req, res) => {
    const match = /^([0-9a-f-]{36})\.png$/.exec(String(req.params.file));
    if (!match?.[1]) throw new HttpError(404, 'not_found', 'We could not find that logo.');
    const file = await company.logoFile(match[1]);
    res
      .status(200)
      .type(file.contentType)
      .set({
        'Content-Length': String(file.size),
        // A new upload gets a new id, so a logo's bytes never change under its address.
        'Cache-Control': 'public, max-age=31536000, immutable',
        // Mail programs and the portal load it from other origins.
        'Cross-Origin-Resource-Policy': 'cross-origin',
      });
    file.stream.on('error', () => res.destroy());
    file.stream.pipe(res);
  });
  return router;
}
