// The local mailbox: what the SMTP capture received. Exists only while the local mail fake is in use.
import { Router } from 'express';
import type { AppDeps } from '../deps';
import { readCapturedMail } from '../mail';
import { notFound } from '../lib/http-error';

export function devMailboxRouter(deps: AppDeps): Router {
  const r = Router();
  const dir = deps.env.MAIL_CAPTURE_DIR;
  r.get('/', async (_req, res) => {
    if (!dir) throw notFound('The local mailbox is off: mail goes to a real SMTP server.');
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
