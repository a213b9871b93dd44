/**
 * A local SMTP server that accepts every message and keeps it in memory: the stand-in for a
 * real mail relay in development, the demo and the tests.
 */
import { simpleParser } from 'mailparser';
import { SMTPServer } from 'smtp-server';

export interface CapturedMail {
  id: number;
  receivedAt: string;
  from: string;
  to: string[];
  subject: string;
  text: string;
  html: string;
  links: string[];
  /** Raw header lines by lower-case name (the last one wins), e.g. list-unsubscribe. */
  headers: Record<string, string>;
}

export interface CaptureServer {
  port: number;
  messages(): CapturedMail[];
  /** Resolves with the first message (new or already received) that matches. */
  waitFor(match: (m: CapturedMail) => boolean, timeoutMs?: number): Promise<CapturedMail>;
  clear(): void;
  close(): Promise<void>;
}

const linkPattern = /https?:\/\/[^\s"'<>]+/g;

export async function startCaptureServer(port = 0, host = '127.0.0.1'): Promise<CaptureServer> {
  const store: CapturedMail[] = [];
  const waiters = new Set<{
    match: (m: CapturedMail) => boolean;
    resolve: (m: CapturedMail) => void;
  }>();
  let nextId = 1;

  const server = new SMTPServer({
    authOptional: true,
    disabledCommands: ['STARTTLS'],
    logger: false,
    onData(stream, session, callback) {
      simpleParser(stream)
        .then((parsed) => {
          const text = parsed.text ?? '';
          const html = typeof parsed.html === 'string' ? parsed.html : '';
          const mail: CapturedMail = {
            id: nextId++,
            receivedAt: new Date().toISOString(),
            from: session.envelope.mailFrom ? session.envelope.mailFrom.address : '',
            to: session.envelope.rcptTo.map((r) => r.address),
            subject: parsed.subject ?? '',
            text,
            html,
            links: [...new Set(text.match(linkPattern) ?? [])],
            headers: Object.fromEntries(
              parsed.headerLines.map((h) => [h.key, h.line.slice(h.line.indexOf(':') + 1).trim()]),
            ),
          };
          store.push(mail);
          for (const w of waiters) {
            if (w.match(mail)) {
              waiters.delete(w);
              w.resolve(mail);
            }
          }
          callback();
        })
        .catch((err: Error) => callback(err));
    },
  });

  await new Promise<void>((resolve, reject) => {
    server.once('error', reject);
    server.listen(port, host, () => resolve());
  });
  const address = server.server.address();
  const boundPort = typeof address === 'object' && address ? address.port : port;

  return {
    port: boundPort,
    messages: () => [...store].reverse(),
    waitFor(match, timeoutMs = 10_000) {
      const found = store.find(match);
      if (found) return Promise.resolve(found);
      return new Promise((resolve, reject) => {
        const waiter = { match, resolve };
        waiters.add(waiter);
        setTimeout(() => {
          if (waiters.delete(waiter)) reject(new Error('No matching mail arrived in time.'));
        }, timeoutMs).unref();
      });
    },
    clear: () => void store.splice(0),
    close: () => new Promise((resolve) => server.close(() => resolve())),
  };
}
