// The local mailbox: what the SMTP capture received. It needs no sign-in (the demo's reset and invitation
// mails are read from the sign-in page), so it answers only when the installation says explicitly that it
// is local (LEGWORK_MODE=local, set by the local orchestration alone) and the capture is in use; anywhere
// else it is 404, whatever MAIL_CAPTURE_DIR or NODE_ENV say.
import { Router } from 'express';
import type { AppDeps } from '../deps';
import { readCapturedMail } from '../mail';
import { notFound } from '../lib/http-error';

export function devMailboxRouter(deps: AppDeps): Router {
  const r = Router();
  const dir = deps.env.LEGWORK_MODE === 'local' ? deps.env.MAIL_CAPTURE_DIR : undefined;
  r.get('/', async (_req, res) => {
    if (!dir)
      throw notFound(
        'The local mailbox is off: it exists only in a local installation (LEGWORK_MODE=local) with the mail capture.',
      );
    const messages = await readCapturedMail(dir);
    res.json({ enabled: true, messages: messages.map(({ html: _html, ...m }) => m) });
  });
  r.get('/:id', async (req, res) => {
    if (!dir) throw notFound('The local mailbox is off.');
    const m = (await readCapturedMail(dir)).find((x) => x.id === req.params.id);
    if (!m) throw notFound('No such message.');
    res.json(m);
  });
  return r;
}
