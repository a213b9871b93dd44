import nodemailer from 'nodemailer';
import type { Logger } from 'pino';
import type { Env } from '../env';

export interface OutgoingMail {
  to: string;
  subject: string;
  text: string;
  html: string;
  /** Extra headers, e.g. List-Unsubscribe on follower mail. */
  headers?: Record<string, string>;
}

/** Hands one message to the relay; the queue (mail-queue.ts) retries and records the outcome. */
export interface Mailer {
  send(mail: OutgoingMail): Promise<void>;
}

/** The mailer the environment names: SMTP, or none (MAIL_DRIVER=off: logged, never sent). */
export function createMailer(env: Env, logger: Logger): Mailer {
  if (env.MAIL_DRIVER === 'off')
    return {
      async send(mail) {
        logger.info(
          { to: mail.to, subject: mail.subject },
          'mail is off (MAIL_DRIVER=off): not sent',
        );
      },
    };
  return createSmtpMailer(env);
}

/** nodemailer over SMTP, one attempt per call. */
export function createSmtpMailer(env: Env): Mailer {
  const transport = nodemailer.createTransport({
    host: env.SMTP_HOST,
    port: env.SMTP_PORT,
    secure: env.SMTP_SECURE,
    auth: env.SMTP_USER ? { user: env.SMTP_USER, pass: env.SMTP_PASSWORD ?? '' } : undefined,
    // Plain local capture servers offer no TLS; real relays should.
    ignoreTLS: env.SMTP_HOST === '127.0.0.1' && !env.SMTP_SECURE,
    // Well inside the queue's two minutes for one send.
    connectionTimeout: 30_000,
    greetingTimeout: 30_000,
    socketTimeout: 60_000,
  });
  return {
    async send(mail) {
      await transport.sendMail({ from: env.MAIL_FROM, ...mail });
    },
  };
}

const escapeHtml = (s: string) =>
  s.replace(
    /[&<>"']/g,
    (c) => ({ '&': '&amp;', '<': '&lt;', '>': '&gt;', '"': '&quot;', "'": '&#39;' })[c]!,
  );

/** One plain layout for every message: text and HTML bodies, no images, no tracking. */
export function composeMail(opts: {
  to: string;
  subject: string;
  lines: string[];
  action?: { label: string; url: string };
}): OutgoingMail {
  const text = [
    ...opts.lines,
    ...(opts.action ? ['', `${opts.action.label}: ${opts.action.url}`] : []),
    '',
    '— Rowtally',
  ].join('\n');
  const html = [
    '<div style="font-family:system-ui,sans-serif;max-width:560px;color:#1f2a1c">',
    '<p style="font-weight:700;color:#2f5d3a">Rowtally</p>',
    ...opts.lines.map((l) => `<p>${escapeHtml(l)}</p>`),
    opts.action
      ? `<p><a href="${escapeHtml(opts.action.url)}" style="background:#2f5d3a;color:#fff;padding:10px 16px;border-radius:6px;text-decoration:none">${escapeHtml(opts.action.label)}</a></p><p style="font-size:12px;color:#555">Or open this address: ${escapeHtml(opts.action.url)}</p>`
      : '',
    '</div>',
  ].join('\n');
  return { to: opts.to, subject: opts.subject, text, html };
}
