import { randomBytes } from 'node:crypto';

const ALPHABET = 'ABCDEFGHIJKLMNOPQRSTUVWXYZabcdefghijklmnopqrstuvwxyz0123456789';

/** An id with Stripe's prefix and 24 random letters or digits (unguessable: hosted pages use it). */
export function newId(prefix: string): string {
  const bytes = randomBytes(24);
  let out = '';
  for (const b of bytes) out += ALPHABET[b % ALPHABET.length];
  return `${prefix}_${out}`;
}

/** Stripe's timestamps are whole seconds since the epoch. */
export function nowSeconds(): number {
  return Math.floor(Date.now() / 1000);
}
