/**
 * The secrets in invitation and password-reset links: 32 random bytes, written base64url
 * (43 characters). Only their SHA-256 is stored, so a copy of the database (a backup, say)
 * opens no account; the token itself lives in the e-mail alone (and in the outbox row until
 * it is sent: mail-outbox.ts blanks it out then). Tokens are never logged.
 */
import { createHash, randomBytes } from 'node:crypto';

/** A token as it appears in a link. */
export const TOKEN_RE = /^[A-Za-z0-9_-]{43}$/;

/** SHA-256 of the token, hex: what the tables keep and look up. */
export function tokenHash(token: string): string {
  return createHash('sha256').update(token, 'utf8').digest('hex');
}

/** A new token and its hash. */
export function newToken(): { token: string; hash: string } {
  const token = randomBytes(32).toString('base64url');
  return { token, hash: tokenHash(token) };
}

/**
 * The hash to look a link's token up by. A string that cannot be a token is still hashed (and
 * then matches nothing), so a well-formed and a malformed token cost the same.
 */
export function lookupHash(token: string): string {
  const h = tokenHash(token.slice(0, 64));
  return TOKEN_RE.test(token) ? h : `!${h}`;
}
