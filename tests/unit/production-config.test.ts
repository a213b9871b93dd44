import { describe, expect, it } from 'vitest';
import { parseEnv, productionProblems } from '../../server/env';

// What a production start needs is this product's own rule (no outside source): a shared
// secret, the public address, a real mail relay or mail explicitly off, and the shared bucket
// whenever more than one instance answers.
const complete = {
  NODE_ENV: 'production',
  AUTH_SECRET: 'x'.repeat(40),
  PUBLIC_URL: 'https://trials.example.org',
  DATABASE_URL: 'postgres://app@db.example.org/rowtally',
  SMTP_HOST: 'relay.example.org',
};
const problemsOf = (source: Record<string, string>) =>
  productionProblems(parseEnv(source), source).map((p) => p.split(':')[0]);

describe('production start', () => {
  it('accepts a complete configuration, with one instance on local photo files', () => {
    expect(problemsOf(complete)).toEqual([]);
  });

  it('names every missing setting at once', () => {
    expect(problemsOf({ NODE_ENV: 'production' })).toEqual([
      'AUTH_SECRET',
      'PUBLIC_URL',
      'DATABASE_URL',
      'SMTP_HOST',
    ]);
  });

  it('takes mail explicitly off instead of a relay, never the default loopback capture', () => {
    const { SMTP_HOST: _relay, ...noRelay } = complete;
    expect(problemsOf(noRelay)).toEqual(['SMTP_HOST']);
    expect(problemsOf({ ...noRelay, MAIL_DRIVER: 'off' })).toEqual([]);
  });

  it('refuses several instances on one host folder of photos, and accepts them on the bucket', () => {
    expect(problemsOf({ ...complete, INSTANCE_COUNT: '3' })).toEqual(['STORAGE_DRIVER']);
    expect(problemsOf({ ...complete, INSTANCE_COUNT: '3', STORAGE_DRIVER: 's3' })).toEqual([]);
  });
});
