import { Router, type RequestHandler } from 'express';
import type { Knex } from 'knex';
import { currentUser, requireSignIn } from '../../http/auth-guards.ts';
import { parseInput } from '../../http/errors.ts';
import type { MediaStorage } from '../../storage/media-storage.ts';
import { editableOrder, readableOrder } from '../inspections/inspection-access.ts';
import { listOrderMedia } from './media.repo.ts';
import { markupInputSchema, type MediaService } from './media.service.ts';
import { fileCaching, sendStoredFile } from './send-stored-file.ts';
import { singleFileUpload } from './upload.ts';

/**
 * Video and stills of an order. Uploads check the permission before a byte of the body
 * is stored, stream to disk, and are checked by content; files are served with HTTP
 * range requests (206) so players can seek, to people who may read the order.
 */
export function mediaRouter(db: Knex, storage: MediaStorage, media: MediaService): Router {
  const router = Router();

  // Refuse before multer reads the body: no one streams a large file into a job they may not touch.
  const editableFirst: RequestHandler = async (req, _res, next) => {
    await editableOrder(db, currentUser(req), String(req.params.orderId), 'order');
    next();
  };

  router.get('/orders/:orderId/media', requireSignIn, async (req, res) => {
    const { order } = await readableOrder(db, currentUser(req), String(req.params.orderId), 'order');
    res.set('Cache-Control', 'no-store').json({ media: await listOrderMedia(db, order.id) });
  });

  router.post(
    '/orders/:orderId/media/videos',
    requireSignIn,
    editableFirst,
    singleFileUpload({ incomingDir: storage.incomingDir, field: 'video', maxBytes: media.limits.maxVideoBytes, what: 'video' }),
    async (req, res) => {
      res.status(201).json({ media: await media.uploadVideo(currentUser(req), String(req.params.orderId), req.file, req.body) });
    },
  );

  router.post(
    '/orders/:orderId/media/stills',
    requireSignIn,
    editableFirst,
    singleFileUpload({ incomingDir: storage.incomingDir, field: 'image', maxBytes: media.limits.maxStillBytes, what: 'picture' }),
    async (req, res) => {
      res.status(201).json({ media: await media.uploadStill(currentUser(req), String(req.params.orderId), req.file, req.body) });
    },
  );

  router.get('/media/:mediaId', requireSignIn, async (req, res) => {
    res.set('Cache-Control', 'no-store').json({ media: await media.getMedia(currentUser(req), String(req.params.mediaId)) });
  });

  const sendFile = (variant: 'file' | 'thumbnail'): RequestHandler => {
    return async (req, res) => {
      const file = await media.openForRead(currentUser(req), String(req.params.mediaId), variant);
      await sendStoredFile(req, res, storage, file, fileCaching.signedIn);
    };
  };

  router.get('/media/:mediaId/file', requireSignIn, sendFile('file'));
  router.get('/media/:mediaId/thumbnail', requireSignIn, sendFile('thumbnail'));

  router.put('/media/:mediaId/markup', requireSignIn, async (req, res) => {
    const input = parseInput(markupInputSchema, req.body);
    res.json({ media: await media.saveMarkup(currentUser(req), String(req.params.mediaId), input) });
  });

  router.delete('/media/:mediaId', requireSignIn, async (req, res) => {
    await media.deleteMedia(currentUser(req), String(req.params.mediaId));
    res.status(204).end();
  });

  return router;
}
