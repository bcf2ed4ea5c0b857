import { Router } from 'express';
import { HttpError, notFound } from '../../http/errors.ts';

/**
 * The demo mailbox: reads what the local fake SMTP server caught, so invitation
 * and reset links can be followed without a real inbox. Mounted only while the
 * fake mail server is in use.
 */
export function mailboxRouter(fakeMailApiUrl: string): Router {
  const router = Router();

  async function relay(path: string) {
    let response: Response;
    try {
      response = await fetch(`${fakeMailApiUrl}${path}`, { signal: AbortSignal.timeout(5_000) });
    } catch {
      throw new HttpError(503, 'mailbox_unavailable', 'The demo mail server is not answering. Start it with `npm start`.');
    }
    if (response.status === 404) throw notFound('message');
    if (!response.ok) throw new HttpError(502, 'mailbox_failed', 'The demo mail server answered with an error.');
    return response.json();
  }

  router.get('/', async (_req, res) => {
    res.json(await relay('/messages'));
  });

  router.get('/:id', async (req, res) => {
    res.json(await relay(`/messages/${encodeURIComponent(req.params.id)}`));
  });

  return router;
}
