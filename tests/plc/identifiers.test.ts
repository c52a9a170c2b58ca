import { describe, expect, it } from 'vitest';
import { IEC_RESERVED_WORDS, identifierProblem, isReservedWord, toIdentifier } from '~/lib/frame/plc-code';

describe('IEC 61131-3 identifiers', () => {
  it.each([
    ['Index 45°', 'Index_45'], ['Jog +1°', 'Jog_Plus_1'], ['Jog −1°', 'Jog_Minus_1'], ['set-point', 'set_point'], ['45 deg', 'Cmd_45_deg'],
    ['', 'Cmd'], ['__a__b__', 'a_b'], ['END_IF', 'END_IF_1'], ['var', 'var_1'], ['DINT_TO_BYTE', 'DINT_TO_BYTE_1'], ['Ström', 'Str_m'],
  ])('%j → %s', (name, id) => {
    expect(toIdentifier(name, 'Cmd')).toBe(id);
    expect(identifierProblem(id)).toBeNull();
  });

  it.each(['9a', 'a__b', 'a_', '_a', 'a b', 'IF', 'mid', 'a'.repeat(61), ''])('%j is refused', (id) => {
    expect(identifierProblem(id)).not.toBeNull();
  });

  it('checks keywords without letter case, and conversion functions as a family', () => {
    for (const w of ['end_var', 'Function_Block', 'TRUE', 'concat', 'INT_TO_BYTE', 'TO_DINT', 'TRUNC_INT']) expect(isReservedWord(w)).toBe(true);
    for (const w of ['Angle', 'Speed', 'Address', 'Into']) expect(isReservedWord(w)).toBe(false);
    expect(IEC_RESERVED_WORDS).toContain('VAR_IN_OUT');
  });
});

describe('POU names', () => {
  it('never take the name of a variable inside the code', async () => {
    const { generatePlcCode } = await import('~/lib/frame/plc-code');
    const { templateSchema } = await import('~/lib/frame');
    const t = templateSchema.parse({ version: 1, segments: [{ type: 'integer', id: 'n', name: 'Count', label: 'N', min: 0, max: 9 }] });
    const r = generatePlcCode([{ template: t }], { name: 'Out' });
    expect(r.ok && [r.value.name, r.value.inputs[0]!.name]).toEqual(['Out_2', 'Count_2']);
    expect(generatePlcCode([{ template: t }], { name: 'S0 1' }).ok).toBe(false);
  });
});
