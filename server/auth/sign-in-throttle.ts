/**
 * Sign-in throttling per account e-mail, next to the sign-in library's per-address limit: a
 * few wrong passwords are free, then each further attempt for that e-mail must wait a delay
 * that doubles with every failure, up to a ceiling. Never a lockout: the right password after
 * the wait signs in, and a success clears the count. The delay is the kind NIST SP 800-63B
 * (section 5.2.2, rate limiting) suggests in place of locking accounts; the numbers are common
 * practice (no source).
 *
 * Every attempt is counted before the password is checked (and forgotten on success), so
 * attempts sent at once from many addresses cannot slip past the count.
 */
import type { DB } from '../../db/database';

export const signInThrottle = {
  /** Wrong passwords allowed before any wait. */
  freeFailures: 5,
  /** The first wait, doubled with each further failure. */
  firstDelaySeconds: 30,
  maxDelaySeconds: 15 * 60,
  /** A count with no failure for this long starts again from zero. */
  idleResetSeconds: 15 * 60,
} as const;

/** The wait that follows the n-th failure in a row (0 while still free). */
export function delayAfterFailures(failures: number): number {
  const { freeFailures, firstDelaySeconds, maxDelaySeconds } = signInThrottle;
  if (failures < freeFailures) return 0;
  return Math.min(maxDelaySeconds, firstDelaySeconds * 2 ** (failures - freeFailures));
}

/** The account key: the address as typed, trimmed and in lower case, known account or not. */
export const throttleKey = (email: string) => email.trim().toLowerCase().slice(0, 320);

/**
 * Counts an attempt for this e-mail, or refuses it while a wait is running (a refused attempt
 * does not lengthen the wait: only checked passwords count).
 */
export async function admitSignIn(
  db: DB,
  email: string,
  now = new Date(),
): Promise<{ admitted: true } | { admitted: false; retryAfterSeconds: number }> {
  const key = throttleKey(email);
  const idleSince = new Date(now.getTime() - signInThrottle.idleResetSeconds * 1000);
  return db.transaction().execute(async (trx) => {
    await trx
      .deleteFrom('sign_in_throttles')
      .where('last_failure_at', '<', idleSince)
      .where((eb) => eb.or([eb('blocked_until', 'is', null), eb('blocked_until', '<', now)]))
      .where('email', '<>', key)
      .execute();
    await trx
      .insertInto('sign_in_throttles')
      .values({ email: key, failures: 0, last_failure_at: now, blocked_until: null })
      .onConflict((oc) => oc.column('email').doNothing())
      .execute();
    const row = await trx
      .selectFrom('sign_in_throttles')
      .selectAll()
      .where('email', '=', key)
      .forUpdate()
      .executeTakeFirstOrThrow();
    if (row.blocked_until && row.blocked_until > now)
      return {
        admitted: false,
        retryAfterSeconds: Math.ceil((row.blocked_until.getTime() - now.getTime()) / 1000),
      };
    const failures = row.last_failure_at < idleSince ? 1 : row.failures + 1;
    const delay = delayAfterFailures(failures);
    await trx
      .updateTable('sign_in_throttles')
      .set({
        failures,
        last_failure_at: now,
        blocked_until: delay ? new Date(now.getTime() + delay * 1000) : null,
      })
      .where('email', '=', key)
      .execute();
    return { admitted: true };
  });
}

/** The right password was given: the count for this e-mail starts again. */
export async function clearSignInThrottle(db: DB, email: string) {
  await db.deleteFrom('sign_in_throttles').where('email', '=', throttleKey(email)).execute();
}

/** Seconds as a person reads them: "45 seconds", "2 minutes". */
export function waitInWords(seconds: number): string {
  if (seconds < 90) return `${seconds} second${seconds === 1 ? '' : 's'}`;
  return `${Math.ceil(seconds / 60)} minutes`;
}
