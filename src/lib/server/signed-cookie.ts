/** Cookie values signed the way the auth library signs them (better-call's `serializeSignedCookie`). */
import { createHmac, timingSafeEqual } from 'node:crypto';

/**
 * The value of a signed cookie (already URL-decoded), or null unless it ends in the signature of that
 * value: `value.` + standard base64 (with padding, 44 characters) of HMAC-SHA256 keyed with `secret`.
 * Compared in constant time.
 */
export function verifySignedValue(signed: string, secret: string): string | null {
  const dot = signed.lastIndexOf('.');
  if (dot < 1) return null;
  const value = signed.slice(0, dot);
  const given = Buffer.from(signed.slice(dot + 1));
  const expected = Buffer.from(createHmac('sha256', secret).update(value).digest('base64'));
  return given.length === expected.length && timingSafeEqual(given, expected) ? value : null;
}
