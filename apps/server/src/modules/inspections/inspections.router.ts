import { Router } from 'express';
import { currentUser, requireSignIn } from '../../http/auth-guards.ts';
import { parseInput } from '../../http/errors.ts';
import { saveInspectionSchema, VersionConflict, type InspectionsService } from './inspections.service.ts';

/** The recorded line of one order: read it whole, save it whole with the version it started from. */
export function inspectionsRouter(inspections: InspectionsService): Router {
  const router = Router();

  router.get('/orders/:orderId/inspection', requireSignIn, async (req, res) => {
    res.set('Cache-Control', 'no-store').json(await inspections.getInspection(currentUser(req), String(req.params.orderId)));
  });

  router.put('/orders/:orderId/inspection', requireSignIn, async (req, res) => {
    const input = parseInput(saveInspectionSchema, req.body);
    try {
      res.json(await inspections.saveInspection(currentUser(req), String(req.params.orderId), input));
    } catch (err) {
      if (!(err instanceof VersionConflict)) throw err;
      // The one problem with a body of its own: what is stored now, so the editor can offer reload or merge.
      res
        .status(409)
        .type('application/problem+json')
        .json({
          type: `about:blank#${err.code}`,
          title: 'Conflict',
          status: 409,
          detail: err.detail,
          code: err.code,
          instance: req.originalUrl.split('?')[0],
          current: err.current,
        });
    }
  });

  return router;
}
