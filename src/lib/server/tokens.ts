// Random link tokens and their stored form. 32 random bytes (256 bits) cannot be guessed, so a
// fast hash is enough at rest: the database keeps only SHA-256(token), never the token itself.
import { createHash, randomBytes } from 'node:crypto';

export function hashToken(token: string): string {
  return createHash('sha256').update(token, 'utf8').digest('hex');
}

export function newToken(): { token: string; hash: string } {
  const token = randomBytes(32).toString('base64url');
  return { token, hash: hashToken(token) };
}
