import { betterAuth } from 'better-auth';
import { APIError, createAuthMiddleware } from 'better-auth/api';
import type { z } from 'zod';
import { personNameSchema, signInBody, signUpBody } from '../../common/contracts/auth';
import type pg from 'pg';
import type { Logger } from 'pino';
import type { DB } from '../../db/database';
import type { Env } from '../env';
import { checkInput, describe } from '../lib/endpoint';
import type { MailKind } from '../../common/contracts/mail';
import type { MailQueue } from '../mail/mail-queue';
import { composeMail } from '../mail/mailer';
import { authRateLimitTable, authSchemaOptions } from './auth-schema';
import { admitSignIn, clearSignInThrottle, waitInWords } from './sign-in-throttle';

/** The header the app sets from the connection (or a trusted loopback proxy) for rate limits. */
export const CLIENT_IP_HEADER = 'x-rowtally-client-ip';

export interface AuthDeps {
  pool: pg.Pool;
  /** The same database through Kysely, for our own sign-in throttling. */
  db: DB;
  env: Env;
  mail: MailQueue;
  logger: Logger;
  baseUrl: string;
  secret: string;
}

/** Queued in the background so the response time does not reveal whether an account exists. */
function sendLater(deps: AuthDeps, kind: MailKind, mail: Parameters<typeof composeMail>[0]) {
  void deps.mail.enqueue(deps.db, composeMail(mail), { kind }).catch((err: unknown) => {
    deps.logger.error({ err, kind }, 'account mail could not be queued');
  });
}

/**
 * Our own request checks in front of the library's, with the same schemas the client's forms
 * use: lengths that fit the users table, one message per field, nothing written on refusal.
 */
const bodyChecks: Record<string, z.ZodType> = {
  '/sign-up/email': signUpBody,
  '/sign-in/email': signInBody,
  '/update-user': personNameSchema.optional().transform((name) => ({ name })),
};

function checkBody(path: string, body: unknown) {
  const schema = bodyChecks[path];
  if (!schema) return;
  const input = path === '/update-user' ? (body as { name?: unknown } | undefined)?.name : body;
  const checked = checkInput(schema, input ?? {}, '');
  if (checked.ok) return;
  const fields = checked.problems.map((f) =>
    path === '/update-user' ? { ...f, path: 'name' } : f,
  );
  // The library answers its own routes, so the same 400 goes out as its error.
  throw new APIError('BAD_REQUEST', {
    code: 'VALIDATION_FAILED',
    message: describe(fields),
    fields,
  });
}

/**
 * Passwords are hashed with the library's default scrypt (N=16384, r=16, p=1, 64-byte key,
 * 16-byte random salt), the parameters it recommends; see db/seed/seed.ts and the tests,
 * which use the same function.
 */
export function createAuth(deps: AuthDeps) {
  const { env, baseUrl } = deps;
  const secure = baseUrl.startsWith('https://');
  return betterAuth({
    appName: 'Rowtally',
    baseURL: baseUrl,
    basePath: '/api/auth',
    secret: deps.secret,
    database: deps.pool,
    trustedOrigins: [baseUrl],
    ...authSchemaOptions,
    emailAndPassword: {
      enabled: true,
      requireEmailVerification: true,
      minPasswordLength: 10,
      maxPasswordLength: 128,
      revokeSessionsOnPasswordReset: true,
      resetPasswordTokenExpiresIn: 60 * 60,
      // Sign-up with a taken address answers like a new one (no account discovery); the owner
      // is told by mail instead.
      onExistingUserSignUp: async ({ user }) => {
        sendLater(deps, 'sign_up_attempt', {
          to: user.email,
          subject: 'Someone tried to sign up to Rowtally with your address',
          lines: [
            `Hello ${user.name},`,
            'Someone (perhaps you) tried to create a new Rowtally account with this address, which already has one.',
            'If it was you, sign in instead, or choose a new password if you have forgotten it. If it was not you, ignore this message.',
          ],
          action: { label: 'Sign in to Rowtally', url: `${baseUrl}/sign-in` },
        });
      },
      sendResetPassword: async ({ user, url }) => {
        sendLater(deps, 'password_reset', {
          to: user.email,
          subject: 'Reset your Rowtally password',
          lines: [
            `Hello ${user.name},`,
            'Someone asked to reset the password of your Rowtally account. The link works for one hour.',
            'If it was not you, ignore this message; your password stays as it is.',
          ],
          action: { label: 'Choose a new password', url },
        });
      },
    },
    emailVerification: {
      sendOnSignUp: true,
      // An unconfirmed account that signs in with the right password gets a fresh link.
      sendOnSignIn: true,
      autoSignInAfterVerification: true,
      expiresIn: 60 * 60 * 24,
      sendVerificationEmail: async ({ user, url }) => {
        sendLater(deps, 'email_verification', {
          to: user.email,
          subject: 'Confirm your e-mail address for Rowtally',
          lines: [
            `Hello ${user.name},`,
            'Confirm this address to finish setting up your Rowtally account.',
          ],
          action: { label: 'Confirm my address', url },
        });
      },
    },
    // Reset links (and any other single-use value the library keeps) are stored as SHA-256
    // digests: a database dump holds no link that works. E-mail confirmation links are signed
    // tokens the library does not store at all. Session tokens cannot be hashed by any option
    // of this library version; a dump's session tokens only work signed with AUTH_SECRET
    // (README, "What a database dump holds").
    verification: { ...authSchemaOptions.verification, storeIdentifier: 'hashed' },
    session: {
      ...authSchemaOptions.session,
      expiresIn: 60 * 60 * 24 * 30,
      updateAge: 60 * 60 * 24,
      // No cookie cache: it would let a signed-out device keep acting for the cache's life.
      // "Sign out everywhere" and a password change (or reset) must end a lost phone's session
      // at its next request, and the cache is only re-checked against the database when it
      // expires. The session and its user are read in one query instead (`joins` below).
      cookieCache: { enabled: false },
    },
    rateLimit: {
      enabled: true,
      storage: 'database',
      ...authRateLimitTable,
      window: 60,
      max: 100,
      customRules: {
        '/sign-in/email': { window: 60, max: 10 },
        '/sign-up/email': { window: 60, max: 5 },
        '/request-password-reset': { window: 60, max: 5 },
        '/reset-password': { window: 60, max: 10 },
      },
    },
    advanced: {
      // The session and its user in one joined query per request, not two.
      database: { joins: true },
      cookiePrefix: 'rowtally',
      useSecureCookies: secure,
      defaultCookieAttributes: { sameSite: 'lax', httpOnly: true, secure },
      // Set by our own middleware from Express's req.ip (server/app.ts), never by the client.
      ipAddress: { ipAddressHeaders: [CLIENT_IP_HEADER] },
      // The library skips its Origin check under NODE_ENV=test; the tests check the real thing.
      disableOriginCheck: false,
      disableCSRFCheck: false,
    },
    // Refusals (wrong password, bad input, foreign origin) are answers, not faults: log them
    // quietly through our logger instead of the library's console output.
    onAPIError: {
      onError: (err) => {
        const status = (err as { statusCode?: number }).statusCode ?? 500;
        if (status >= 500) deps.logger.error({ err }, '[auth] request failed');
        else
          deps.logger.info({ status, message: (err as Error).message }, '[auth] request refused');
      },
    },
    hooks: {
      before: createAuthMiddleware(async (ctx) => {
        checkBody(ctx.path, ctx.body);
        if (ctx.path === '/sign-in/email') {
          const verdict = await admitSignIn(deps.db, String(ctx.body.email));
          if (!verdict.admitted)
            throw new APIError(
              'TOO_MANY_REQUESTS',
              {
                code: 'SIGN_IN_DELAYED',
                message: `Too many wrong passwords for this account. Wait ${waitInWords(verdict.retryAfterSeconds)} and try again.`,
                retryAfterSeconds: verdict.retryAfterSeconds,
              },
              { 'Retry-After': String(verdict.retryAfterSeconds) },
            );
        }
      }),
      after: createAuthMiddleware(async (ctx) => {
        if (ctx.path !== '/sign-in/email') return;
        const returned = ctx.context.returned;
        // The right password (even for an address still to be confirmed) clears the count.
        const rightPassword =
          !(returned instanceof APIError) ||
          (returned.body as { code?: string } | undefined)?.code === 'EMAIL_NOT_VERIFIED';
        if (rightPassword) await clearSignInThrottle(deps.db, String(ctx.body.email));
      }),
    },
    logger: {
      level: env.NODE_ENV === 'test' ? 'error' : 'warn',
      log: (level, message, ...args) => {
        const method = level === 'error' ? 'error' : level === 'warn' ? 'warn' : 'info';
        deps.logger[method]({ args }, `[auth] ${message}`);
      },
    },
  });
}

export type Auth = ReturnType<typeof createAuth>;
