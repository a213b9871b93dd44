import type { Request, RequestHandler } from 'express';
import { Router } from 'express';
import type { Env } from '../env';
import type { CaptureServer } from './capture-server';

/**
 * The development mailbox shows every message with its links (password resets included), so it
 * is only for the person at this computer: served only while mail goes to our own capture
 * server, outside production, and only to callers whose connection comes from this machine.
 */
export function mailboxInUse(env: Env, mailbox: CaptureServer | undefined): boolean {
  return (
    mailbox !== undefined &&
    env.NODE_ENV !== 'production' &&
    isLoopback(env.SMTP_HOST) &&
    env.SMTP_PORT === mailbox.port
  );
}

function isLoopback(address: string | undefined): boolean {
  if (!address) return false;
  if (address === 'localhost' || address === '::1') return true;
  const v4 = address.startsWith('::ffff:') ? address.slice('::ffff:'.length) : address;
  return /^127\.\d{1,3}\.\d{1,3}\.\d{1,3}$/.test(v4);
}

/**
 * A caller on this machine: judged by the socket's remote address, never by a header. A request
 * that a proxy forwarded (it says so in a header) is refused even from loopback, since the
 * person behind the proxy may be anywhere; a header can only refuse, never admit.
 */
export function fromThisMachine(req: Request): boolean {
  if (!isLoopback(req.socket.remoteAddress)) return false;
  return !['forwarded', 'x-forwarded-for', 'x-real-ip'].some((h) => req.headers[h] !== undefined);
}

/** Anyone else is told there is nothing here. */
export const thisMachineOnly: RequestHandler = (req, res, next) => {
  if (fromThisMachine(req)) return next();
  res.status(404).type('text').send('Not found');
};

/** Development only: the messages the local capture server received, newest first. */
export function mailboxRouter(mailbox: CaptureServer) {
  const router = Router();
  router.use(thisMachineOnly);
  router.get('/', (_req, res) => {
    res.json({ messages: mailbox.messages() });
  });
  router.delete('/', (_req, res) => {
    mailbox.clear();
    res.status(204).end();
  });
  return router;
}

/** What `npm start` prints about the mailbox, so no one mistakes it for a real mail service. */
export function mailboxBanner(baseUrl: string, smtpPort: number): string {
  return [
    `Development mailbox: mail is not delivered. A capture server on 127.0.0.1:${smtpPort} keeps`,
    `every message in memory, readable at ${baseUrl}/dev/mailbox from this computer only.`,
    'For real mail set SMTP_HOST (and SMTP_USER / SMTP_PASSWORD) to your relay.',
  ].join('\n');
}
