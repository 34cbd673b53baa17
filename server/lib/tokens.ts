/**
 * One-time tokens for e-mailed links: 32 random bytes, base64url (43 characters). Only the SHA-256 of
 * a token is stored; a token is looked up by hashing what the link carries.
 */
import { createHash, randomBytes } from 'node:crypto';

const TOKEN_BYTES = 32;

export function hashToken(token: string): string {
  return createHash('sha256').update(token, 'utf8').digest('hex');
}

export function newToken(): { token: string; tokenHash: string } {
  const token = randomBytes(TOKEN_BYTES).toString('base64url');
  return { token, tokenHash: hashToken(token) };
}
