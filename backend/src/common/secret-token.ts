import { createHash, randomBytes } from 'node:crypto';

/** A fresh secret for a link or an API token (256 bits), with a readable prefix. */
export function newSecret(prefix = ''): string {
  return `${prefix}${randomBytes(32).toString('base64url')}`;
}

/** What is stored instead of a secret: its SHA-256, hex. */
export function hashSecret(secret: string): string {
  return createHash('sha256').update(secret).digest('hex');
}
