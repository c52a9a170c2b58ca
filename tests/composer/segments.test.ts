import { describe, expect, it } from 'vitest';
import { assembleFrame, templateSchema, toHex, type Template } from '../../src/lib/frame';
import { addSegment, applyCase, duplicateSegment, nudgeSegment, removeSegment, starterTemplate } from '../../src/lib/composer/segments';
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
