import crypto from 'node:crypto';

/** A readable address from a name: lower-case words joined by hyphens. */
export function wordsOf(name: string, fallback: string): string {
  const base = name
    .normalize('NFKD')
    .replace(/[\u0300-\u036f]/g, '')
    .toLowerCase()
    .replace(/[^a-z0-9]+/g, '-')
    .replace(/^-+|-+$/g, '')
    .slice(0, 60)
    .replace(/-+$/g, '');
  return base || fallback;
}

/** Letters and digits that cannot be read as one another (no i, l, o, 0, 1). */
const tailAlphabet = 'abcdefghjkmnpqrstuvwxyz23456789';

/**
 * A new address: the name's words and a short random tail, always. Were the tail added only
 * when the plain address is taken, an outsider could learn from their own new trial's (or
 * variety's) address that a private one of that name exists.
 */
export function newAddress(name: string, fallback: string): string {
  let tail = '';
  for (let i = 0; i < 6; i++) tail += tailAlphabet[crypto.randomInt(tailAlphabet.length)];
  return `${wordsOf(name, fallback)}-${tail}`;
}
