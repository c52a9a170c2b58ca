/**
 * Frame engine speed figures. Prints measured value, target and PASS/FAIL per line; a miss is reported,
 * not failed, because timings depend on the machine.
 */
import { test } from 'vitest';
import { type FieldValues, frameRulesSchema, parseEscaped, previewFrame, renderEscaped, templateSchema } from '~/lib/frame';

const hex = (s: string) => Array.from(new TextEncoder().encode(s), (b) => b.toString(16).padStart(2, '0')).join(' ');

/** STX, invented command text, five fields, CRC-16/MODBUS as ascii hex, CR: 64 bytes. */
const template64 = templateSchema.parse({
  version: 1,
  segments: [
    { type: 'literal', id: 's', bytes: '02' },
    { type: 'literal', id: 'c', bytes: hex('AXIS MOVE ') },
    { type: 'integer', id: 'n', name: 'axis', label: 'Axis', width: 2 },
    { type: 'literal', id: 'p1', bytes: hex(' POS=') },
    { type: 'integer', id: 'a', name: 'angle', label: 'Angle', unit: '°', scale: { factor: 100 }, width: 9, sign: 'always' },
    { type: 'literal', id: 'p2', bytes: hex(' SPD=') },
    { type: 'decimal', id: 'v', name: 'speed', label: 'Speed', decimals: 2, width: 8 },
    { type: 'literal', id: 'p3', bytes: hex(' DIR=') },
    { type: 'choice', id: 'd', name: 'dir', label: 'Direction', options: [{ value: 'cw', send: 'CW' }, { value: 'ccw', send: 'CCW' }] },
    { type: 'literal', id: 'p4', bytes: hex(' TAG=') },
    { type: 'text', id: 't', name: 'tag', label: 'Tag', case: 'upper', maxLength: 8 },
    { type: 'checksum', id: 'k', algorithm: 'CRC-16/MODBUS', range: { from: 1, to: 'checksum' }, encoding: 'ascii-hex' },
    { type: 'terminator', id: 'e', bytes: '0D' },
  ],
});
const values64: FieldValues = { axis: 3, angle: -123.45, speed: 1500.5, dir: 'ccw', tag: 'st-007' };
const settings = {
  dataBits: 8,
  frameRules: frameRulesSchema.parse({ start: '02', terminator: '0D', byteSet: 'printable', letterCase: 'upper', maxLength: 300, forbidden: '03', addressRange: { min: 1, max: 32 }, addressField: 'axis' }),
};

/** The same model stretched to 256 bytes with a long text field. */
const template256 = templateSchema.parse({
  version: 1,
  segments: [
    ...template64.segments.slice(0, 10),
    { type: 'text', id: 't', name: 'tag', label: 'Tag', case: 'upper', maxLength: 250 },
    ...template64.segments.slice(11),
  ],
});
const values256: FieldValues = { ...values64, tag: 'X'.repeat(198) };

function perSecond(fn: () => void, ms = 1000): number {
  for (let i = 0; i < 2000; i++) fn();
  let n = 0;
  const start = performance.now();
  let now = start;
  while (now - start < ms) {
    for (let i = 0; i < 500; i++) fn();
    n += 500;
    now = performance.now();
  }
  return (n * 1000) / (now - start);
}

function medianMs(fn: () => void, runs: number): number {
  const times: number[] = [];
  for (let i = 0; i < runs; i++) {
    const t0 = performance.now();
    fn();
    times.push(performance.now() - t0);
  }
  times.sort((a, b) => a - b);
  return times[Math.floor(runs / 2)]!;
}

test('frame engine benchmark', () => {
  const rows: [string, string, string, boolean][] = [];

  const p64 = previewFrame(template64, values64, settings);
  if (p64.byteCount !== 64 || p64.findings.length) throw new Error(`64-byte frame is ${p64.byteCount} bytes with ${p64.findings.length} findings`);
  const fps = perSecond(() => previewFrame(template64, values64, settings));
  rows.push(['(a) 64-byte frame: assemble + CRC-16 + all notations + checks', `${Math.round(fps).toLocaleString('en-US')} frames/s`, '>= 100,000 frames/s', fps >= 100_000]);

  const raw = new Uint8Array(1024 * 1024);
  let lcg = 12345;
  for (let i = 0; i < raw.length; i++) {
    lcg = (lcg * 1103515245 + 12345) >>> 0;
    // mostly printable text with some control and high bytes, like a capture log
    raw[i] = lcg % 10 === 0 ? (lcg >>> 8) & 0xff : 0x20 + ((lcg >>> 8) % 95);
  }
  const text = renderEscaped(raw).slice(0, 1024 * 1024).replace(/\\[^\\]{0,3}$/, '');
  const escapedMs = medianMs(() => {
    const r = parseEscaped(text);
    if (!r.ok) throw new Error(r.error.message);
    renderEscaped(r.value);
  }, 15);
  rows.push([`(b) parse + render ${(text.length / 1048576).toFixed(2)} MiB of escaped text`, `${escapedMs.toFixed(1)} ms`, '< 100 ms', escapedMs < 100]);

  const p256 = previewFrame(template256, values256, settings);
  if (p256.byteCount !== 256) throw new Error(`256-byte frame is ${p256.byteCount} bytes`);
  const previewMs = 1000 / perSecond(() => previewFrame(template256, values256, settings), 500);
  const p99Ms = (() => {
    const times: number[] = [];
    for (let i = 0; i < 5000; i++) {
      const t0 = performance.now();
      previewFrame(template256, values256, settings);
      times.push(performance.now() - t0);
    }
    times.sort((a, b) => a - b);
    return times[Math.floor(times.length * 0.99)]!;
  })();
  rows.push(['(c) preview recompute, 256-byte frame (mean)', `${(previewMs * 1000).toFixed(1)} µs`, '< 1 ms', previewMs < 1]);
  rows.push(['    same, 99th percentile of 5000 runs', `${(p99Ms * 1000).toFixed(1)} µs`, '< 1 ms', p99Ms < 1]);

  const w = [Math.max(...rows.map((r) => r[0].length)), Math.max(...rows.map((r) => r[1].length)), Math.max(...rows.map((r) => r[2].length))];
  const line = (c: string[]) => `${c[0]!.padEnd(w[0]!)}  ${c[1]!.padStart(w[1]!)}  ${c[2]!.padEnd(w[2]!)}  ${c[3]}\n`;
  let out = '\nFrame engine benchmark\n' + line(['measure', 'measured', 'target', 'result']);
  for (const r of rows) out += line([r[0], r[1], r[2], r[3] ? 'PASS' : 'FAIL']);
  process.stdout.write(out + '\n');
});
