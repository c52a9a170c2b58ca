import { describe, expect, test } from 'vitest';
import { assembleFrame, loadTemplate, moveSegment, serializeTemplate, templateSchema, toHex } from '~/lib/frame';
import { hexOf, tpl } from './helpers';

// Invented command syntax used throughout: "TURN <angle>" + CR.
const STEPS_PER_REV = 36000;
const turn = (extra: object = {}) =>
  tpl([
    { type: 'literal', id: 'cmd', bytes: hexOf('TURN ') },
    { type: 'integer', id: 'a', name: 'angle', label: 'Angle', unit: '°', scale: { factor: STEPS_PER_REV / 360 }, sign: 'always', ...extra },
    { type: 'terminator', id: 'end', bytes: '0D' },
  ]);

describe('scaling degrees to motor steps', () => {
  test('36,000 steps/rev: 45° → 4500 steps, 1° → 100 steps', () => {
    // common practice: a drive set to 36,000 steps per revolution indexes 45° with 4,500 steps and 1° with 100
    expect(toHex(assembleFrame(turn(), { angle: 45 }).bytes)).toBe(hexOf('TURN +4500\r'));
    expect(toHex(assembleFrame(turn(), { angle: 1 }).bytes)).toBe(hexOf('TURN +100\r'));
    expect(assembleFrame(turn(), { angle: '45' }).segments[1]).toMatchObject({ name: 'angle', value: 45, raw: 4500, start: 5, end: 10 });
  });
  test('negative jog keeps its sign; zero padding goes after the sign', () => {
    expect(toHex(assembleFrame(turn(), { angle: -2.5 }).bytes)).toBe(hexOf('TURN -250\r'));
    expect(toHex(assembleFrame(turn({ width: 7 }), { angle: -2.5 }).bytes)).toBe(hexOf('TURN -000250\r'));
    expect(toHex(assembleFrame(turn({ width: 7, pad: 'space', sign: 'negative' }), { angle: -2.5 }).bytes)).toBe(hexOf('TURN    -250\r'));
    expect(toHex(assembleFrame(turn({ sign: 'negative' }), { angle: 2.5 }).bytes)).toBe(hexOf('TURN 250\r'));
  });
  test('rounding half away from zero, with a not-integer warning', () => {
    const r = assembleFrame(tpl([{ type: 'integer', id: 'x', name: 'x', label: 'X', scale: { factor: 1, offset: 0 } }]), { x: -0.5 });
    expect(toHex(r.bytes)).toBe(hexOf('-1'));
    expect(r.findings).toMatchObject([{ severity: 'warning', code: 'field-not-integer', range: [0, 2] }]);
    expect(r.ok).toBe(true);
  });
  test('offset', () => {
    const t = tpl([{ type: 'integer', id: 'x', name: 't', label: 'Temp', scale: { factor: 10, offset: 400 } }]);
    expect(toHex(assembleFrame(t, { t: -12.5 }).bytes)).toBe(hexOf('275'));
  });
});

describe('segment map and defaults', () => {
  test('every segment has index, id and byte range', () => {
    const r = assembleFrame(turn({ default: 90 }), {});
    expect(r.byteCount).toBe(11);
    expect(r.segments).toEqual([
      { index: 0, id: 'cmd', type: 'literal', start: 0, end: 5 },
      { index: 1, id: 'a', type: 'integer', start: 5, end: 10, name: 'angle', value: 90, raw: 9000 },
      { index: 2, id: 'end', type: 'terminator', start: 10, end: 11 },
    ]);
    expect(r.findings).toEqual([]);
  });
  test('empty template gives an empty frame', () => {
    expect(assembleFrame(tpl([]), {})).toMatchObject({ ok: true, byteCount: 0, segments: [], findings: [] });
  });
});

describe('field kinds', () => {
  test('decimal with fixed decimals', () => {
    const t = tpl([{ type: 'decimal', id: 'd', name: 'speed', label: 'Speed', decimals: 2, width: 6 }]);
    expect(toHex(assembleFrame(t, { speed: 1.005 }).bytes)).toBe(hexOf('001.01'));
    expect(toHex(assembleFrame(t, { speed: -3 }).bytes)).toBe(hexOf('-03.00'));
    expect(assembleFrame(t, { speed: 1.005 }).findings[0]).toMatchObject({ code: 'field-rounded', severity: 'warning' });
  });
  test('text with case conversion and allowed characters', () => {
    const t = tpl([{ type: 'text', id: 't', name: 'code', label: 'Code', case: 'upper', maxLength: 4, allowed: 'ABCDEF0123456789' }]);
    expect(toHex(assembleFrame(t, { code: 'be0f' }).bytes)).toBe(hexOf('BE0F'));
  });
  test('text bytes 0x7F-0xFF are refused by the default (printable) set', () => {
    const t = tpl([{ type: 'text', id: 't', name: 'x', label: 'X' }]);
    const r = assembleFrame(t, { x: 'a\u007fb\u0080\u00ff' });
    expect(toHex(r.bytes)).toBe('61 7F 62 80 FF');
    expect(r.findings).toMatchObject([{ code: 'field-invalid-char', range: [1, 2] }]);
  });
  test('upper and lower case and choice keys fold ASCII letters only', () => {
    const t = tpl([{ type: 'text', id: 't', name: 'x', label: 'X', case: 'upper' }]);
    // 'ſ' (U+017F) would upper-case to "S" and 'ß' to "SS"; both must stay refused, not become ASCII
    expect(assembleFrame(t, { x: 'abſ' }).findings).toMatchObject([{ code: 'field-invalid-char', range: [2, 3] }]);
    expect(toHex(assembleFrame(t, { x: 'abß' }).bytes)).toBe('41 42 DF');
    const c = tpl([{ type: 'choice', id: 'c', name: 'c', label: 'C', options: [{ value: 'kelvin', send: 'K' }] }]);
    expect(assembleFrame(c, { c: 'KELVIN' }).ok).toBe(true);
    expect(assembleFrame(c, { c: '\u212Aelvin' }).findings).toMatchObject([{ code: 'field-invalid' }]);
  });
  test('choice sends the option text', () => {
    const t = tpl([{ type: 'choice', id: 'c', name: 'dir', label: 'Direction', options: [{ value: 'forward', send: 'F' }, { value: 'reverse', send: 'R' }] }]);
    expect(toHex(assembleFrame(t, { dir: 'reverse' }).bytes)).toBe('52');
    expect(assembleFrame(t, { dir: 'Forward' }).segments[0]).toMatchObject({ value: 'forward', raw: 'F' });
  });
});

describe('field finding codes', () => {
  const num = tpl([{ type: 'integer', id: 'n', name: 'n', label: 'Speed', unit: 'rpm', min: 0, max: 100, width: 3 }]);
  test.each([
    [{}, 'field-missing', 'error'],
    [{ n: 'fast' }, 'field-invalid', 'error'],
    [{ n: ' ' }, 'field-invalid', 'error'],
    [{ n: 120 }, 'field-out-of-range', 'error'],
    [{ n: -1 }, 'field-out-of-range', 'error'],
    [{ n: 2.4 }, 'field-not-integer', 'warning'],
  ])('%j → %s', (values, code, severity) => {
    const r = assembleFrame(num, values);
    expect(r.findings[0]).toMatchObject({ code, severity, segmentId: 'n' });
    expect(r.findings[0]!.message.length).toBeGreaterThan(20);
    expect(r.ok).toBe(severity !== 'error');
  });
  test('wider than its width after scaling', () => {
    const t = tpl([{ type: 'integer', id: 'n', name: 'deg', label: 'Angle', width: 4, scale: { factor: 100 } }]);
    const r = assembleFrame(t, { deg: 45 });
    expect(toHex(r.bytes)).toBe(hexOf('4500'));
    expect(assembleFrame(t, { deg: 100 }).findings).toMatchObject([{ code: 'field-too-wide', severity: 'error', range: [0, 5] }]);
  });
  test('text too long, and choice not in the list', () => {
    const t = tpl([
      { type: 'text', id: 't', name: 't', label: 'T', maxLength: 2 },
      { type: 'choice', id: 'c', name: 'c', label: 'C', options: [{ value: 'a', send: 'A' }] },
    ]);
    const r = assembleFrame(t, { t: 'abcd', c: 'z' });
    expect(r.findings.map((f) => [f.code, f.range])).toEqual([['field-too-long', [2, 4]], ['field-invalid', [4, 4]]]);
  });
});

describe('checksum segments', () => {
  test('range from a segment index to the checksum, ascii hex, as in STX payload ETX style frames', () => {
    // Modbus guide V1.02, 2.5.2.2 (LRC over the message, sent as two ASCII hex characters); range excludes the start byte
    const t = tpl([
      { type: 'literal', id: 's', bytes: '3A' },
      { type: 'literal', id: 'p', bytes: '01 03 00 9B' },
      { type: 'checksum', id: 'k', algorithm: 'LRC', range: { from: 1, to: 'checksum' }, encoding: 'ascii-hex' },
      { type: 'terminator', id: 'e', bytes: '0D 0A' },
    ]);
    const r = assembleFrame(t, {});
    expect(toHex(r.bytes)).toBe('3A 01 03 00 9B 36 31 0D 0A');
    expect(r.segments[2]).toMatchObject({ start: 5, end: 7, raw: 0x61 });
  });
  test('CRC-16/MODBUS binary low byte first', () => {
    // Modbus guide V1.02, 6.2.2: CRC of 02 07 = 0x1241, low byte sent first
    const t = tpl([
      { type: 'literal', id: 'p', bytes: '02 07' },
      { type: 'checksum', id: 'k', algorithm: 'crc-16/modbus', byteOrder: 'low-first' },
    ]);
    expect(toHex(assembleFrame(t, {}).bytes)).toBe('02 07 41 12');
  });
  test('range to an explicit segment', () => {
    const t = tpl([
      { type: 'literal', id: 'a', bytes: '10' },
      { type: 'literal', id: 'b', bytes: '20' },
      { type: 'literal', id: 'c', bytes: 'F0' },
      { type: 'checksum', id: 'k', algorithm: 'SUM-8', range: { from: 0, to: 1 } },
    ]);
    expect(toHex(assembleFrame(t, {}).bytes)).toBe('10 20 F0 30');
  });
});

describe('template JSON', () => {
  test('versioned form round-trips and fills defaults', () => {
    const saved = serializeTemplate(turn());
    expect(saved.ok).toBe(true);
    const json = saved.ok ? saved.value : '';
    expect(JSON.parse(json)).toMatchObject({ version: 1, segments: [{ id: 'cmd' }, { id: 'a', pad: 'zero', sign: 'always' }, { id: 'end' }] });
    const loaded = loadTemplate(json);
    expect(loaded.ok && loaded.value).toEqual(turn());
  });
  test('schema refuses bad templates', () => {
    const bad = (segments: unknown[]) => templateSchema.safeParse({ version: 1, segments }).success;
    expect(bad([{ type: 'literal', id: 'x', bytes: '0G' }])).toBe(false);
    expect(bad([{ type: 'literal', id: 'x', bytes: '00' }, { type: 'literal', id: 'x', bytes: '00' }])).toBe(false);
    expect(bad([{ type: 'checksum', id: 'k', algorithm: 'LRC', range: { from: 0, to: 'checksum' } }])).toBe(false);
    expect(bad([{ type: 'checksum', id: 'k', algorithm: 'NOPE' }])).toBe(false);
    expect(bad([{ type: 'terminator', id: 'a', bytes: '0D' }, { type: 'terminator', id: 'b', bytes: '0D' }])).toBe(false);
    expect(templateSchema.safeParse({ version: 2, segments: [] }).success).toBe(false);
    expect(loadTemplate('{not json')).toMatchObject({ ok: false });
    expect(loadTemplate({ version: 1, segments: [{ type: 'bogus', id: 'a' }] })).toMatchObject({ ok: false });
  });
  test('moveSegment keeps checksum ranges on the same segments', () => {
    const t = tpl([
      { type: 'literal', id: 'a', bytes: '01' },
      { type: 'literal', id: 'b', bytes: '02' },
      { type: 'checksum', id: 'k', algorithm: 'XOR-8', range: { from: 1, to: 1 } },
    ]);
    const r = moveSegment(t, 1, 0);
    if (!r.ok) throw new Error(r.error.message);
    const moved = r.value;
    expect(moved.segments.map((s) => s.id)).toEqual(['b', 'a', 'k']);
    expect(moved.segments[2]).toMatchObject({ range: { from: 0, to: 0 } });
    expect(toHex(assembleFrame(moved, {}).bytes)).toBe('02 01 02');
  });
});
