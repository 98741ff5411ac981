import { createHash, randomBytes } from 'node:crypto';
import { API_TOKEN_PREFIX } from '@localis/shared';

/** A new secret: the prefix and 32 random bytes, base64url. Only its SHA-256 is stored. */
export function newTokenSecret(): { secret: string; prefix: string; hash: string } {
  const secret = API_TOKEN_PREFIX + randomBytes(32).toString('base64url');
  return { secret, prefix: secret.slice(0, API_TOKEN_PREFIX.length + 6), hash: hashToken(secret) };
}

export function hashToken(secret: string): string {
  return createHash('sha256').update(secret, 'utf8').digest('hex');
}
