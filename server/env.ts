import fs from 'node:fs';
import path from 'node:path';
import { fileURLToPath } from 'node:url';
import { z } from 'zod';

/** The folder holding package.json: found upwards, so source (server/) and build (dist/server/) agree. */
function findProjectRoot(from: string): string {
  for (let dir = from; ; dir = path.dirname(dir)) {
    if (fs.existsSync(path.join(dir, 'package.json'))) return dir;
    if (path.dirname(dir) === dir) return path.resolve(from, '..');
  }
}

export const projectRoot = findProjectRoot(path.dirname(fileURLToPath(import.meta.url)));

const port = z.coerce.number().int().min(1).max(65535);

const envSchema = z.object({
  NODE_ENV: z.enum(['development', 'production', 'test']).default('development'),
  HOST: z.string().default('127.0.0.1'),
  PORT: port.default(3000),
  /** The address people reach the app at; links in e-mail are built from it. */
  PUBLIC_URL: z.url().optional(),
  DATABASE_URL: z.url().optional(),
  ROWTALLY_DB_PORT: port.default(55432),
  ROWTALLY_DATA_DIR: z.string().optional(),
  DB_POOL_MAX: z.coerce.number().int().min(1).max(200).default(10),
  /** Analyses (spreadsheet, trial trait, ranking) one account or address may ask for per minute. */
  ANALYSIS_RATE_PER_MINUTE: z.coerce.number().int().min(1).max(100_000).default(60),
  /** Longest one analysis may run before it is stopped and answered 422. */
  ANALYSIS_TIME_LIMIT_MS: z.coerce.number().int().min(50).max(600_000).default(10_000),
  AUTH_SECRET: z.string().min(32).optional(),
  /** `off` sends no mail at all (links are shown only in the log); production must say so. */
  MAIL_DRIVER: z.enum(['smtp', 'off']).default('smtp'),
  SMTP_HOST: z.string().default('127.0.0.1'),
  SMTP_PORT: port.default(2525),
  SMTP_USER: z.string().optional(),
  SMTP_PASSWORD: z.string().optional(),
  SMTP_SECURE: z.stringbool().default(false),
  MAIL_FROM: z.string().default('Rowtally <no-reply@rowtally.local>'),
  /** Retries of a message the relay refused or could not take, before it is marked failed. */
  MAIL_RETRY_LIMIT: z.coerce.number().int().min(0).max(50).default(10),
  /** Wait before the first retry; each later one waits about twice as long (with jitter). */
  MAIL_RETRY_DELAY_SECONDS: z.coerce.number().int().min(1).max(3600).default(30),
  UPLOADS_DIR: z.string().default(path.join(projectRoot, 'uploads')),
  STORAGE_DRIVER: z.enum(['local', 's3']).default('local'),
  S3_ENDPOINT: z.url().optional(),
  S3_BUCKET: z.string().optional(),
  S3_REGION: z.string().default('us-east-1'),
  S3_ACCESS_KEY_ID: z.string().optional(),
  S3_SECRET_ACCESS_KEY: z.string().optional(),
  /** How many app servers share this database; more than one needs the shared bucket. */
  INSTANCE_COUNT: z.coerce.number().int().min(1).max(64).default(1),
  LOG_LEVEL: z.enum(['fatal', 'error', 'warn', 'info', 'debug', 'trace', 'silent']).default('info'),
});

export type Env = z.infer<typeof envSchema>;

/** Parses the environment once at start-up; a bad value stops the process with its name. */
export function parseEnv(source: NodeJS.ProcessEnv = process.env): Env {
  const result = envSchema.safeParse(source);
  if (!result.success) {
    const lines = result.error.issues.map((i) => `  ${i.path.join('.')}: ${i.message}`);
    throw new Error(`Invalid configuration in the environment:\n${lines.join('\n')}`);
  }
  return result.data;
}

/**
 * What a production start refuses to run without, each with the variable to set. A production
 * server never falls back to a generated secret, the loopback mail capture, or photo files in
 * one host's folder when several hosts answer.
 */
export function productionProblems(env: Env, source: NodeJS.ProcessEnv = process.env): string[] {
  const problems: string[] = [];
  if (!env.AUTH_SECRET)
    problems.push(
      'AUTH_SECRET: set a random secret of 32+ characters, the same on every instance.',
    );
  if (!env.PUBLIC_URL)
    problems.push('PUBLIC_URL: set the address people reach the app at (links in mail use it).');
  if (!env.DATABASE_URL) problems.push('DATABASE_URL: set the PostgreSQL connection string.');
  if (env.MAIL_DRIVER === 'smtp' && !source.SMTP_HOST)
    problems.push('SMTP_HOST: name the mail relay, or set MAIL_DRIVER=off to send no mail.');
  if (env.INSTANCE_COUNT > 1 && env.STORAGE_DRIVER !== 's3')
    problems.push(
      `STORAGE_DRIVER: ${env.INSTANCE_COUNT} instances need STORAGE_DRIVER=s3, so every instance sees every photo.`,
    );
  return problems;
}
