/**
 * Outgoing mail goes through a queue kept in PostgreSQL (pg-boss): a request only writes the
 * message and its job, in the caller's transaction when there is one, and a worker sends it
 * with retries and growing waits. Nothing is lost when the relay or the app is down, and every
 * app process on the database shares the one queue.
 */
import { CompiledQuery } from 'kysely';
import PgBoss from 'pg-boss';
import type pg from 'pg';
import type { Logger } from 'pino';
import type { MailKind } from '../../common/contracts/mail';
import type { DB } from '../../db/database';
import type { Env } from '../env';
import type { Mailer, OutgoingMail } from './mailer';
import * as repo from './mail-repository';

const QUEUE = 'outgoing-mail';
/** pg-boss keeps its tables in a schema of its own in our database. */
export const MAIL_QUEUE_SCHEMA = 'pgboss';

export interface MailQueue {
  /**
   * Queues a message. With a transaction, the message is sent only if it commits; without one,
   * the message row and its job are written together.
   */
  enqueue(
    db: DB,
    mail: OutgoingMail,
    about: { kind: MailKind; trialId?: string; invitationId?: string },
  ): Promise<string>;
  /** Stops taking new jobs and waits (up to the time given) for messages being sent. */
  stop(timeoutMs?: number): Promise<void>;
}

export interface MailQueueOptions {
  pool: pg.Pool;
  db: DB;
  env: Env;
  logger: Logger;
  transport: Mailer;
  /** Send queued mail from this process (off for a process that only writes to the queue). */
  work?: boolean;
}

type Job = PgBoss.JobWithMetadata<{ mailId: string }>;

const wait = (ms: number) => new Promise((resolve) => setTimeout(resolve, ms));

/** pg-boss runs its SQL through our pool, or through the caller's transaction. */
function sqlOn(db: DB): PgBoss.Db {
  return {
    executeSql: async (text, values) => {
      const result = await db.executeQuery(CompiledQuery.raw(text, values ?? []));
      return { rows: [...result.rows] };
    },
  };
}

function bossFor(pool: pg.Pool, pollingIntervalSeconds: number) {
  return new PgBoss({
    db: { executeSql: (text, values) => pool.query(text, values) },
    schema: MAIL_QUEUE_SCHEMA,
    // Creates or upgrades its own tables under an advisory lock, so several app processes may
    // start together.
    migrate: true,
    schedule: false,
    pollingIntervalSeconds,
  });
}

/** Creates pg-boss's tables (the test template does this once so each test database has them). */
export async function installMailQueue(pool: pg.Pool): Promise<void> {
  const boss = bossFor(pool, 2);
  boss.on('error', () => {});
  await boss.start();
  await boss.createQueue(QUEUE);
  await boss.stop({ graceful: false, close: false });
}

export function createMailQueue(opts: MailQueueOptions): MailQueue {
  const { db, env, logger, transport } = opts;
  const retry = {
    retryLimit: env.MAIL_RETRY_LIMIT,
    retryDelay: env.MAIL_RETRY_DELAY_SECONDS,
    retryBackoff: true,
    // A send that hangs this long is taken as failed and retried.
    expireInSeconds: 120,
  };
  let stopping = false;
  let boss: PgBoss | null = null;
  let workerId: string | null = null;

  async function deliver(job: Job) {
    const row = await repo.pendingMail(db, job.data.mailId);
    // Sent already (a job run twice), or its trial was deleted since.
    if (!row) return;
    try {
      await transport.send({ to: row.recipient, subject: row.subject, ...row.body });
    } catch (err) {
      const message = (err instanceof Error ? err.message : String(err)).slice(0, 500);
      const final = job.retryCount >= job.retryLimit;
      logger.warn(
        { err, mailId: row.id, attempt: job.retryCount + 1, final },
        final ? 'mail could not be sent; given up' : 'mail could not be sent; will retry',
      );
      await repo.recordFailure(db, row.id, message, final);
      throw err;
    }
    // The relay has the message: record that even across a short database outage, since a
    // job that failed here would be sent a second time.
    for (let attempt = 1; ; attempt++) {
      try {
        await repo.recordSent(db, row.id);
        return;
      } catch (err) {
        if (attempt >= 10) throw err;
        await wait(500 * attempt);
      }
    }
  }

  const started = (async () => {
    for (;;) {
      if (stopping) throw new Error('The mail queue was stopped before it started.');
      const b = bossFor(opts.pool, env.NODE_ENV === 'test' ? 0.5 : 2);
      b.on('error', (err) => logger.warn({ err }, 'mail queue: database error; will try again'));
      try {
        await b.start();
        await b.createQueue(QUEUE);
        if (opts.work !== false && !stopping) {
          workerId = await b.work<{ mailId: string }>(
            QUEUE,
            { batchSize: 1, includeMetadata: true },
            async (jobs) => {
              try {
                for (const job of jobs) await deliver(job);
              } finally {
                // Look for the next message at once rather than after the polling interval.
                if (jobs.length && workerId && !stopping) b.notifyWorker(workerId);
              }
            },
          );
        }
        boss = b;
        return b;
      } catch (err) {
        await b.stop({ graceful: false, close: false }).catch(() => {});
        if (stopping) throw err;
        logger.warn({ err }, 'mail queue could not start; trying again');
        await wait(2000);
      }
    }
  })();
  started.catch(() => {});

  return {
    async enqueue(target, mail, about) {
      const b = await started;
      const write = async (trx: DB) => {
        const id = await repo.insertMail(trx, { ...about, mail });
        await b.send(QUEUE, { mailId: id }, { ...retry, db: sqlOn(trx) });
        return id;
      };
      const id = target.isTransaction
        ? await write(target)
        : await target.transaction().execute(write);
      if (workerId && !target.isTransaction) b.notifyWorker(workerId);
      return id;
    },
    async stop(timeoutMs = 10_000) {
      if (stopping) return;
      stopping = true;
      const b = boss ?? (await started.catch(() => null));
      await b?.stop({ graceful: true, wait: true, timeout: timeoutMs, close: false });
    },
  };
}
