import { createHash, randomBytes } from 'node:crypto';

/** A sortable-enough random id with a readable prefix, e.g. `dev_3k9x...`. */
export function newId(prefix: string): string {
  return `${prefix}_${randomBytes(12).toString('base64url')}`;
}

export function randomToken(): string {
  return randomBytes(24).toString('base64url');
}

export function sha256(value: string): string {
  return createHash('sha256').update(value).digest('hex');
}
