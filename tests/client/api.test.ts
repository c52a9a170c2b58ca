/** The browser-side API call: what it throws when an answer is a refusal, and when no answer comes at all. */
import { afterEach, describe, expect, it, vi } from 'vitest';
import { api, ApiError, NO_NETWORK } from '../../src/lib/client/api';

afterEach(() => vi.unstubAllGlobals());
/** The error a call throws; a call that resolves fails the test. */
const failure = (p: Promise<unknown>) => p.then(() => { throw new Error('expected the call to throw'); }, (e: unknown) => e as ApiError);

describe('api()', () => {
  it('says the server could not be reached when fetch rejects (no network), not the browser\'s "Failed to fetch"', async () => {
    vi.stubGlobal('fetch', async () => { throw new TypeError('Failed to fetch'); });
    const err = await failure(api('/api/devices/dev_1/field-log', { body: { kind: 'verified' } }));
    expect(err).toBeInstanceOf(ApiError);
    expect(err.status).toBe(0);
    expect(err.message).toBe(NO_NETWORK);
  });

  it('carries the server\'s message and fields on a refusal', async () => {
    vi.stubGlobal('fetch', async () => new Response(JSON.stringify({ error: 'Check the fields.', fields: { note: 'Too long.' } }), { status: 422 }));
    const err = await failure(api('/api/devices', { body: {} }));
    expect(err).toBeInstanceOf(ApiError);
    expect([err.status, err.message, err.fields]).toEqual([422, 'Check the fields.', { note: 'Too long.' }]);
  });
});
