import type { Actor } from '../../common/policy';
import { AppError } from '../lib/app-error';

/** After a passing write check the actor is always signed in; this says so to the compiler. */
export function requireActorOf(actor: Actor | null): Actor {
  if (!actor) throw new AppError('unauthenticated', 'Sign in to do this.');
  return actor;
}
