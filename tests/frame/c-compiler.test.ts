/**
 * The escaped notation read back by the system C compiler: every rendering, put in a C string literal,
 * must give exactly the bytes rendered (ISO/IEC 9899, 6.4.4.4: hex escapes are greedy, octal escapes take
 * at most three digits; 5.2.1.1: trigraphs such as ??= are replaced before anything else in strict modes).
 * CI installs gcc when `cc` is missing (.ci/run).
 */
import { execFileSync, spawnSync } from 'node:child_process';
import { mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import fc from 'fast-check';
import { afterAll, describe, expect, test } from 'vitest';
import { renderEscaped, toHex } from '~/lib/frame';

const hasCc = spawnSync('cc', ['--version']).status === 0;
if (!hasCc) console.warn('c-compiler.test.ts skipped: no C compiler (`cc`) on this machine; install gcc to run it (.ci/run does).');

// Bytes a C literal treats specially: hex and octal digits after an escape, quotes, backslash, trigraph
// characters, NUL, and 0x7F-0xFF.
const SPECIAL = [0x00, 0x01, 0x07, 0x08, 0x09, 0x0a, 0x0d, 0x1b, 0x1f, 0x22, 0x27, 0x3f, 0x3d, 0x28, 0x2f, 0x29, 0x3c, 0x21, 0x3e, 0x2d, 0x5c,
  0x30, 0x37, 0x38, 0x39, 0x41, 0x46, 0x47, 0x61, 0x66, 0x67, 0x78, 0x7f, 0x80, 0xff];
const arrays = fc.sample(
  fc.oneof(
    fc.uint8Array({ maxLength: 64 }),
    fc.array(fc.constantFrom(...SPECIAL), { maxLength: 48 }).map((a) => Uint8Array.from(a)),
  ),
  { numRuns: 3000, seed: 20240611 },
);
// Fixed cases first: the misreadings a compiler showed with greedy hex escapes, quotes and trigraphs.
const FIXED = [[0x01, 0x41], [0x1b, 0x46], [0x22], [0x3f, 0x3f, 0x3d], [0x3f, 0x3f, 0x3f, 0x2f], [0x00, 0x31], [0x00, 0x38], [0x7f, 0x66], [0xff, 0x30], [], [0x00, 0x7f, 0x80, 0xff]].map((a) => Uint8Array.from(a));
const cases = [...FIXED, ...arrays];

const dir = mkdtempSync(join(tmpdir(), 'escaped-c-'));
afterAll(() => rmSync(dir, { recursive: true, force: true }));

function cProgram(list: Uint8Array[]): string {
  const lines = ['#include <stdio.h>', '#include <stddef.h>'];
  list.forEach((b, i) => lines.push(`static const unsigned char s${i}[] = "${renderEscaped(b)}";`));
  lines.push('static const unsigned char *const items[] = {', ...list.map((_, i) => `  s${i},`), '};');
  lines.push('static const size_t sizes[] = {', ...list.map((_, i) => `  sizeof s${i} - 1,`), '};');
  lines.push(
    'int main(void) {',
    '  for (size_t i = 0; i < sizeof sizes / sizeof sizes[0]; i++) {',
    '    for (size_t j = 0; j < sizes[i]; j++) printf(j ? " %02X" : "%02X", items[i][j]);',
    '    putchar(10);',
    '  }',
    '  return 0;',
    '}',
  );
  return lines.join('\n') + '\n';
}

describe.skipIf(!hasCc)('a C compiler reads the escaped notation back as the same bytes', () => {
  const source = join(dir, 'escaped.c');
  writeFileSync(source, cProgram(cases));
  // c99 turns trigraphs on; gnu11 is gcc's default dialect. -pedantic-errors makes an out-of-range escape fail.
  test.each(['-std=c99', '-std=gnu11'])('%s', (std) => {
    const exe = join(dir, `escaped${std.replace(/\W/g, '')}`);
    execFileSync('cc', [std, '-pedantic-errors', '-o', exe, source], { stdio: ['ignore', 'ignore', 'pipe'] });
    const out = execFileSync(exe, { maxBuffer: 64 * 1024 * 1024 }).toString().split('\n');
    expect(out.length - 1).toBe(cases.length);
    cases.forEach((b, i) => {
      if (out[i] !== toHex(b)) expect({ rendered: renderEscaped(b), read: out[i] }).toEqual({ rendered: renderEscaped(b), read: toHex(b) });
    });
  }, 120_000);
});
