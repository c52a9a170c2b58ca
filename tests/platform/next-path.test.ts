import { describe, expect, it } from 'vitest';
import { safeNextPath } from '../../src/lib/auth/next-path';

const ORIGIN = 'https://baudbook.example.test';

describe('safeNextPath', () => {
  it.each([
    ['/team', '/team'],
    ['/invitations/accept?token=a%2Bb', '/invitations/accept?token=a%2Bb'],
    ['/vault/devices#ports', '/vault/devices#ports'],
    ['/a/../team', '/team'],
    [`${ORIGIN}/team?x=1`, '/team?x=1'],
    ['/%5Cevil.test', '/%5Cevil.test'],
    ['/%2F%2Fevil.test', '/%2F%2Fevil.test'],
  ])('keeps the same-origin path %s', (raw, want) => {
    expect(safeNextPath(raw, ORIGIN)).toBe(want);
  });

  it.each([
    ['backslash', '/\\evil.test/x'],
    ['backslashes', '\\\\evil.test'],
    ['tab', '/\t/evil.test'],
    ['newline', '/\n/evil.test'],
    ['protocol-relative', '//evil.test/x'],
    ['dot segment to //', '/.//evil.test'],
    ['scheme', 'javascript:alert(1)'],
    ['data', 'data:text/html,hi'],
    ['absolute elsewhere', 'https://evil.test/team'],
    ['same host, other scheme', 'http://baudbook.example.test/team'],
    ['same host, other port', 'https://baudbook.example.test:8443/team'],
    ['user info', 'https://baudbook.example.test@evil.test/'],
    ['relative', 'team'],
    ['empty', ''],
  ])('refuses %s', (_name, raw) => {
    expect(safeNextPath(raw, ORIGIN)).toBeNull();
  });

  it('refuses nothing given', () => {
    expect(safeNextPath(null, ORIGIN)).toBeNull();
    expect(safeNextPath(undefined, ORIGIN)).toBeNull();
  });
});
