import { Router } from 'express';
import type { CaptureServer } from './capture-server';

/** Development only: the messages the local capture server received, newest first. */
export function mailboxRouter(mailbox: CaptureServer) {
  const router = Router();
  router.get('/', (_req, res) => {
    res.json({ messages: mailbox.messages() });
  });
  router.delete('/', (_req, res) => {
    mailbox.clear();
    res.status(204).end();
  });
  return router;
}
