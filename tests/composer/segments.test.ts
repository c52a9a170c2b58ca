import * as ref from 'js-crc/models';
import { describe, expect, it } from 'vitest';
import { assembleFrame, portSettingsSchema, previewFrame, templateSchema, toHex, type Template } from '../../src/lib/frame';
import { addSegment, applyCase, duplicateSegment, nudgeSegment, removeSegment, restartForPort, starterTemplate } from '../../src/lib/composer/segments';
import { labelOfBytes, textOfHex, hexOfText, CONTROL_CHOICES } from '../../src/lib/composer/bytes-text';

const hex = (t: Template, values = {}) => toHex(assembleFrame(templateSchema.parse(t), values).bytes);

describe('segment editor helpers', () => {
  it('starts from the port frame rules: start bytes and terminator', () => {
    expect(starterTemplate({ start: '02', terminator: '03' }).segments.map((s) => [s.type, 'bytes' in s ? s.bytes : ''])).toEqual([['literal', '02'], ['terminator', '03']]);
    expect(starterTemplate({}).segments).toEqual([{ type: 'terminator', id: 'end', bytes: '0D' }]);
  });

  it('adds before the terminator, follows the letter case, and refuses a second terminator', () => {
    let t = starterTemplate({ terminator: '0D' });
    t = addSegment(t, 'text', { letterCase: 'upper' }, { text: 'go:' });
    t = addSegment(t, 'control', {}, { code: 0x02 });
    expect(hex(t)).toBe('47 4F 3A 02 0D');
    expect(t.segments[1]).toMatchObject({ label: 'STX' });
    expect(addSegment(t, 'terminator')).toBe(t);
    const withField = addSegment(addSegment(t, 'integer'), 'integer');
    expect(withField.segments.filter((s) => s.type === 'integer').map((s) => ('name' in s ? s.name : ''))).toEqual(['value', 'value2']);
    expect(templateSchema.safeParse(withField).success).toBe(true);
  });

  it('changes the case of ASCII letters only', () => {
    // 'ſ' (U+017F) upper-cases to "S" in Unicode; a literal must not gain an S the user never typed
    expect(applyCase('goſ', { letterCase: 'upper' })).toBe('GOſ');
    expect(applyCase('GO\u212A', { letterCase: 'lower' })).toBe('go\u212A');
  });

  it('keeps checksum ranges on the same segments through duplicate, move and remove', () => {
    let t = addSegment(starterTemplate(), 'text', {}, { text: 'AB' });
    t = addSegment(t, 'text', {}, { text: 'C' });
    t = addSegment(t, 'checksum', {}, { algorithm: 'SUM-8' });
    t = { ...t, segments: t.segments.map((s) => (s.type === 'checksum' ? { ...s, range: { from: 1, to: 1 } } : s)) } as Template;
    // A B C [sum of C] CR
    expect(hex(t)).toBe('41 42 43 34 33 0D');
    const dup = duplicateSegment(t, 0);
    expect(hex(dup)).toBe('41 42 41 42 43 34 33 0D');
    const moved = nudgeSegment(t, 1, -1);
    expect(hex(moved)).toBe('43 41 42 34 33 0D');
    const removed = removeSegment(t, 0);
    expect(hex(removed)).toBe('43 34 33 0D');
    const lost = removeSegment(t, 1);
    expect(lost.segments.find((s) => s.type === 'checksum')).toMatchObject({ range: { from: 'start', to: 'checksum' } });
    expect(templateSchema.safeParse(lost).success).toBe(true);
  });

  it('converts text, labels and control choices', () => {
    expect(hexOfText('1!')).toBe('31 21');
    expect(labelOfBytes('02 41 20 0D')).toBe('<STX>A <CR>');
    expect(textOfHex('41 42')).toBe('AB');
    expect(textOfHex('41 0D')).toBeNull();
    expect(CONTROL_CHOICES).toHaveLength(33);
    expect(CONTROL_CHOICES[13]).toEqual({ code: 13, name: 'CR', hex: '0D' });
  });
});

describe('checksum defaults follow the port protocol', () => {
  const text = (t: Template) => new TextDecoder('latin1').decode(assembleFrame(templateSchema.parse(t), {}).bytes);

  it('Modbus ASCII: starts with ":" and CR LF; the checksum is the LRC over the decoded hex, after the ":"', () => {
    let t = starterTemplate({}, 'modbus-ascii');
    expect(t.segments).toMatchObject([{ type: 'literal', bytes: '3A' }, { type: 'terminator', bytes: '0D 0A' }]);
    t = addSegment(t, 'text', {}, { text: '010300000001' });
    t = addSegment(t, 'checksum', {}, { protocol: 'modbus-ascii' });
    expect(t.segments[2]).toMatchObject({ type: 'checksum', algorithm: 'LRC', over: 'decoded-hex', encoding: 'ascii-hex', range: { from: 1, to: 'checksum' } });
    // Modbus over Serial Line V1.02, 2.5.2.2: LRC of 01 03 00 00 00 01 is 0xFB
    expect(text(t)).toBe(':010300000001FB\r\n');
    // text added later goes before the checksum, and the checksum still starts after the ":"
    t = addSegment(t, 'text', {}, { text: '00' });
    expect(t.segments.map((s) => s.type)).toEqual(['literal', 'literal', 'literal', 'checksum', 'terminator']);
    expect(text(t)).toBe(':01030000000100FB\r\n');
    const port = portSettingsSchema.parse({ protocol: 'modbus-ascii' });
    expect(previewFrame(templateSchema.parse(t), {}, port).findings).toEqual([]);
  });

  it('Modbus RTU: no terminator; the checksum is CRC-16/MODBUS, binary, low byte first', () => {
    let t = starterTemplate({}, 'modbus-rtu');
    expect(t.segments).toEqual([]);
    t = { ...t, segments: [{ type: 'literal', id: 'pdu', bytes: '01 03 00 00 00 01' }] };
    t = addSegment(t, 'checksum', {}, { protocol: 'modbus-rtu' });
    expect(t.segments[1]).toMatchObject({ type: 'checksum', algorithm: 'CRC-16/MODBUS', encoding: 'binary', byteOrder: 'low-first', over: 'bytes' });
    // Modbus over Serial Line V1.02, 6.2.2 (low byte first); the CRC value cross-checked with js-crc's crc_16_modbus
    const crc = parseInt(ref.crc_16_modbus(Uint8Array.from([1, 3, 0, 0, 0, 1])), 16);
    expect(toHex(assembleFrame(templateSchema.parse(t), {}).bytes)).toBe(toHex(Uint8Array.from([1, 3, 0, 0, 0, 1, crc & 0xff, crc >> 8])));
    t = addSegment(t, 'integer');
    expect(t.segments.map((s) => s.type)).toEqual(['literal', 'integer', 'checksum']);
  });

  it('other protocols keep the XOR-8 block check in hex characters', () => {
    const t = addSegment(addSegment(starterTemplate({}), 'text', {}, { text: 'AB' }), 'checksum', {}, { protocol: 'ascii' });
    expect(t.segments[1]).toMatchObject({ algorithm: 'XOR-8', encoding: 'ascii-hex', over: 'bytes', byteOrder: 'high-first' });
    expect(text(t)).toBe('AB03\r'); // 0x41 XOR 0x42 = 0x03
  });

  it('a chosen model brings its byte order', () => {
    const add = (algorithm: string) => addSegment(addSegment(starterTemplate({}, 'modbus-rtu'), 'text', {}, { text: 'AB' }), 'checksum', {}, { algorithm, protocol: 'modbus-rtu' }).segments[1];
    expect(add('CRC-32/ISCSI')).toMatchObject({ algorithm: 'CRC-32/ISCSI', encoding: 'binary', byteOrder: 'low-first' });
    expect(add('CRC-16/XMODEM')).toMatchObject({ algorithm: 'CRC-16/XMODEM', encoding: 'binary', byteOrder: 'high-first' });
  });

  it('an untouched starter follows a change of port; an edited template stays', () => {
    const rtu = portSettingsSchema.parse({ protocol: 'modbus-rtu' });
    const service = portSettingsSchema.parse({ protocol: 'ascii', frameRules: { terminator: '0D' } });
    const fresh = starterTemplate(rtu.frameRules, rtu.protocol);
    expect(restartForPort(fresh, rtu, service).segments).toEqual([{ type: 'terminator', id: 'end', bytes: '0D' }]);
    const ascii = portSettingsSchema.parse({ protocol: 'modbus-ascii' });
    expect(restartForPort(restartForPort(fresh, rtu, service), service, ascii).segments.map((s) => ('bytes' in s ? s.bytes : ''))).toEqual(['3A', '0D 0A']);
    const edited = addSegment(fresh, 'text', {}, { text: 'A' });
    expect(restartForPort(edited, rtu, service)).toBe(edited);
  });
});

