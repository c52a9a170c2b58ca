import { describe, expect, it } from 'vitest';
import { assembleFrame, checkFrame, latin1Bytes, portSettingsSchema } from '../../src/lib/frame';
import { byteCells } from '../../src/lib/composer/cells';
import { notationRows } from '../../src/lib/composer/notations';
import { guessNotation, readReply } from '../../src/lib/composer/reply';
import { timingSummary } from '../../src/lib/composer/timing';
import { wireLayout } from '../../src/lib/composer/wire';
import { scaleFromStepsPerRev, stepsPerRevOf } from '../../src/lib/composer/scaling';
import { fieldValueProblem, valuesSchemaFor } from '../../src/lib/schemas/commands';
import { jogTemplate, statusQueryTemplate } from '../../src/lib/composer/demo';

const bytes = (s: string) => latin1Bytes(s) as Uint8Array;
const port8N1 = portSettingsSchema.parse({ baud: 9600 });

describe('byte cells', () => {
  it('name the segment of every byte and carry the worst finding', () => {
    const f = assembleFrame(jogTemplate('+'), {});
    const findings = checkFrame(f.bytes, f.segments, { letterCase: 'lower' });
    const cells = byteCells(f.bytes, f.segments, jogTemplate('+'), findings);
    expect(cells.map((c) => c.glyph).join(' ')).toBe('1 ! J O G : + 1 0 0 CR');
    expect(cells[0]).toMatchObject({ offset: 0, hex: '31', decimal: 49, segmentLabel: 'Field Drive address' });
    expect(cells[2]).toMatchObject({ segmentLabel: 'Literal "!JOG:"', severity: 'warning' });
    expect(cells[10]).toMatchObject({ segmentLabel: 'Terminator', hex: '0D' });
  });
});

describe('notations', () => {
  it('lists every notation including register words with their count and order', () => {
    const rows = notationRows(bytes('ABC\r'), 'low-first');
    expect(Object.fromEntries(rows.map((r) => [r.id, r.text]))).toEqual({
      iecLiteral: "'ABC$0D'", iec: 'ABC$0D', escaped: 'ABC\\r', mnemonic: 'ABC<CR>', hex: '41 42 43 0D', decimal: '65 66 67 13',
      wordsHex: '4241 0D43', wordsDecimal: '16961 3395',
    });
    expect(rows.find((r) => r.id === 'wordsHex')!.hint).toBe('2 words, first byte in the low half');
    expect(notationRows(bytes('ABC')).find((r) => r.id === 'wordsHex')!.hint).toContain('padded');
  });
});

describe('timing', () => {
  it('works out character, frame, reply, gaps and polls per second on the bus planner\'s model', () => {
    const t = timingSummary({ ...port8N1, protocol: 'ascii', turnaroundDelayMs: 5 }, 11, 21);
    const v = Object.fromEntries(t.rows.map((r) => [r.id, r.value]));
    expect(t.shorthand).toBe('9600 8-N-1');
    expect(v).toMatchObject({ char: '1.042 ms', frame: '11.458 ms', response: '0.000 ms', reply: '21.875 ms', t15: '1.563 ms', t35: '3.646 ms', turnaround: '5.000 ms' });
    // Other protocols (issue 15, common practice): request + response time + reply + turnaround = 11.458 + 0 + 21.875 + 5 = 38.333 ms → 26.1 polls/s
    expect([v.transaction, v.polls]).toEqual(['38.333 ms', '26.1']);
    // Modbus RTU (Modbus over Serial Line V1.02 §2.5.1.1): 11.458 + 3.646 + 5 (response) + 21.875 + 3.646 = 45.625 ms → 21.9 polls/s;
    // the turnaround delay is not counted after a reply.
    const r = Object.fromEntries(timingSummary({ ...port8N1, protocol: 'modbus-rtu', turnaroundDelayMs: 100 }, 11, 21, 5).rows.map((x) => [x.id, x.value]));
    expect([r.response, r.transaction, r.polls, r.turnaround]).toEqual(['5.000 ms', '45.625 ms', '21.9', undefined]);
    // No reply on Modbus RTU: request + interval + turnaround = 11.458 + 3.646 + 100 = 115.104 ms, shown to 0.1 ms above 100 ms.
    const b = timingSummary({ ...port8N1, protocol: 'modbus-rtu', turnaroundDelayMs: 100 }, 11, null);
    expect(b.rows.some((x) => x.id === 'reply')).toBe(false);
    expect(b.rows.find((x) => x.id === 'transaction')!.value).toBe('115.1 ms');
  });
});

describe('wire picture', () => {
  it('lays out idle, start, data LSB first, stop with byte labels and time marks', () => {
    const r = wireLayout(bytes('1\r'), port8N1);
    if (!r.ok) throw new Error(r.error.message);
    const w = r.value;
    expect(w.cells.map((c) => c.label).join('')).toBe('idleS10001100stopS10110000stopidle');
    expect(w.bytes.map((b) => b.label)).toEqual(['31 1', '0D CR']);
    expect(w.marks.map((m) => m.label)).toEqual(['0 µs', '1.042 ms', '2.083 ms']);
    expect(w.path.startsWith('M44.0 44 H74.0 V78')).toBe(true);
    expect(wireLayout(bytes('0123456789'), port8N1, 8)).toMatchObject({ ok: true, value: { truncated: true, shownBytes: 8 } });
  });
  it('answers the engine error for settings code passed in unchecked', () => {
    const bad = wireLayout(bytes('1'), { ...port8N1, dataBits: Infinity } as never);
    expect(bad.ok).toBe(false);
    expect(!bad.ok && bad.error.message).toMatch(/^dataBits Infinity is outside the line settings/);
  });
});

describe('reply notation', () => {
  it('guesses the notation of pasted text', () => {
    expect(guessNotation("'1=STA$0D'")).toBe('iec');
    expect(guessNotation('1=STA<CR>')).toBe('mnemonic');
    expect(guessNotation('1=STA\\r')).toBe('escaped');
    expect(guessNotation('31 3D 0D')).toBe('hex');
    expect(guessNotation('16#31 16#3D 16#0D')).toBe('hex');
    expect(guessNotation('31h 3Dh 0Dh')).toBe('hex');
    expect(guessNotation('<XOFF>')).toBe('mnemonic');
    expect(readReply('16#0D')).toMatchObject({ ok: true, notation: 'hex', bytes: Uint8Array.of(0x0d) });
    expect(guessNotation('plain')).toBe('escaped');
    expect(readReply('31 0D')).toMatchObject({ ok: true, notation: 'hex' });
    expect(readReply('41 4', 'hex')).toMatchObject({ ok: true });
    expect(readReply("'A'B'", 'iec')).toMatchObject({ ok: false, notation: 'iec' });
  });
});

describe('field values schema and scaling', () => {
  it('checks each field and refuses unknown keys', () => {
    const s = valuesSchemaFor(jogTemplate('+'));
    expect(s.safeParse({ angle: '2', address: '' }).success).toBe(true);
    const bad = s.safeParse({ angle: '20', address: 'x', other: 1 });
    expect(bad.success).toBe(false);
    expect(bad.error!.issues.map((i) => [i.path.join('.'), i.message])).toEqual([
      ['address', 'Drive address must be a number.'], ['angle', 'At most 10 °.'], ['other', 'The template has no field named "other".'],
    ]);
    const choice = { type: 'choice', id: 'c', name: 'c', label: 'C', options: [{ value: 'a', send: 'A' }] } as const;
    expect(fieldValueProblem(choice as never, 'b')).toBe('Choose one of a.');
    expect(valuesSchemaFor(statusQueryTemplate).safeParse({}).success).toBe(true);
  });

  it('takes plain decimal digits only, and compares limits exactly, like the engine', () => {
    const angle = { type: 'integer', id: 'a', name: 'angle', label: 'Angle', unit: '°', min: 0, max: 0.3, pad: 'zero', sign: 'negative' } as const;
    expect(fieldValueProblem(angle, '0x10')).toBe('Angle: "0x10" is hex; enter the value in decimal digits (16).');
    expect(fieldValueProblem(angle, '1e-1')).toBe('Angle: "1e-1" uses an exponent; write the digits out (0.1).');
    expect(fieldValueProblem(angle, 'Infinity')).toBe('Angle must be a number.');
    expect(fieldValueProblem(angle, ' 0.3 ')).toBeNull();
    expect(fieldValueProblem(angle, '0.30000000000000001')).toBe('At most 0.3 °.');
  });

  it('turns steps per revolution into a degrees scale and back', () => {
    expect(scaleFromStepsPerRev(36000)).toEqual({ factor: 100, offset: 0 });
    expect(stepsPerRevOf({ unit: '°', scale: { factor: 100, offset: 0 } })).toBe(36000);
    expect(stepsPerRevOf({ unit: 'mm', scale: { factor: 100, offset: 0 } })).toBeNull();
  });
});
