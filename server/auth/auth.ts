import { betterAuth } from 'better-auth';
import type pg from 'pg';
import type { Logger } from 'pino';
import type { Env } from '../env';
import { composeMail, type Mailer } from '../mail/mailer';
import { authRateLimitTable, authSchemaOptions } from './auth-schema';

/** The header the app sets from the connection (or a trusted loopback proxy) for rate limits. */
export const CLIENT_IP_HEADER = 'x-rowtally-client-ip';

export interface AuthDeps {
  pool: pg.Pool;
  env: Env;
  mailer: Mailer;
  logger: Logger;
  baseUrl: string;
  secret: string;
}

/** Mail is sent in the background so the response time does not reveal whether an account exists. */
function sendLater(deps: AuthDeps, mail: Parameters<typeof composeMail>[0]) {
  void deps.mailer.send(composeMail(mail)).catch((err: unknown) => {
    deps.logger.error({ err, to: mail.to }, 'account mail could not be sent after retries');
  });
}

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
      sendResetPassword: async ({ user, url }) => {
        sendLater(deps, {
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
      autoSignInAfterVerification: true,
      expiresIn: 60 * 60 * 24,
      sendVerificationEmail: async ({ user, url }) => {
        sendLater(deps, {
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
    session: {
      ...authSchemaOptions.session,
      expiresIn: 60 * 60 * 24 * 30,
      updateAge: 60 * 60 * 24,
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
      cookiePrefix: 'rowtally',
      useSecureCookies: secure,
      defaultCookieAttributes: { sameSite: 'lax', httpOnly: true, secure },
      // Set by our own middleware from Express's req.ip (server/app.ts), never by the client.
      ipAddress: { ipAddressHeaders: [CLIENT_IP_HEADER] },
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
