import { describe, expect, it } from 'vitest';
import { serializeSignedCookie } from 'better-call';
import { verifySignedValue } from '../../src/lib/server/signed-cookie';

const SECRET = 'test-secret-not-for-production-0123456789abcdef';

/** The value as the auth library's own cookie writer signs it (the reference implementation). */
async function signedByLibrary(value: string, secret = SECRET): Promise<string> {
  const header = await serializeSignedCookie('c', value, secret);
  return decodeURIComponent(header.slice(2).split(';')[0]!);
}

describe('verifySignedValue', () => {
  it('accepts values the library signed, including ones whose signature has + and /', async () => {
    for (let i = 0; i < 40; i++) {
      const value = `token${i}-${'x'.repeat(i)}`;
      expect(verifySignedValue(await signedByLibrary(value), SECRET)).toBe(value);
    }
  });

  it('refuses another secret, a changed value, a forged or missing signature', async () => {
    const signed = await signedByLibrary('abc123');
    const [value, signature] = [signed.slice(0, signed.lastIndexOf('.')), signed.slice(signed.lastIndexOf('.') + 1)];
    expect(signature).toHaveLength(44);
    expect(verifySignedValue(signed, `${SECRET}x`)).toBeNull();
    expect(verifySignedValue(`abc124.${signature}`, SECRET)).toBeNull();
    expect(verifySignedValue(`${value}.${'A'.repeat(43)}=`, SECRET)).toBeNull();
    expect(verifySignedValue(`${value}.${signature.slice(0, -1)}`, SECRET)).toBeNull();
    expect(verifySignedValue(`${value}.${signature.replace(/=$/, '')}`, SECRET)).toBeNull();
    expect(verifySignedValue(`${value}.forgedsignature`, SECRET)).toBeNull();
    expect(verifySignedValue(value, SECRET)).toBeNull();
    expect(verifySignedValue(`${value}.`, SECRET)).toBeNull();
    expect(verifySignedValue(`.${signature}`, SECRET)).toBeNull();
    expect(verifySignedValue('', SECRET)).toBeNull();
  });
});
