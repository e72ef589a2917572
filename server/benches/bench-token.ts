import { createHash, randomBytes, timingSafeEqual } from 'node:crypto';

/** A new bench token: 32 random bytes, URL-safe. Shown once; only its hash is stored. */
export function newBenchToken(): string {
  return 'bench-' + randomBytes(32).toString('base64url');
}

/** SHA-256 of a token, hex. Tokens are random, so a fast unsalted hash is enough. */
export function hashBenchToken(token: string): string {
  return createHash('sha256').update(token, 'utf8').digest('hex');
}

/**
 * Index of the hash matching `token`, or -1. Compares against every candidate in constant time
 * and without stopping early, so the time taken says nothing about which bench or how close.
 */
export function matchBenchToken(token: string, hashes: readonly string[]): number {
  const given = Buffer.from(hashBenchToken(token), 'hex');
  let found = -1;
  hashes.forEach((h, i) => {
    const candidate = Buffer.from(h, 'hex');
    if (candidate.length === given.length && timingSafeEqual(candidate, given) && found < 0) {
      found = i;
    }
  });
  return found;
}
