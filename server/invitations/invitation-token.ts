import crypto from 'node:crypto';

/** A fresh link token: 32 random bytes, base64url (43 characters). Only its hash is stored. */
export function newInvitationToken(): { token: string; hash: string } {
  const token = crypto.randomBytes(32).toString('base64url');
  return { token, hash: hashInvitationToken(token) };
}

/** sha256, hex: what the invitations table keeps instead of the token. */
export function hashInvitationToken(token: string): string {
  return crypto.createHash('sha256').update(token, 'utf8').digest('hex');
}
