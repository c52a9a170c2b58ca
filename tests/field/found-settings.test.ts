import { describe, expect, it } from 'vitest';
import { fieldLogCreateSchema, foundPortSettingsSchema } from '../../src/lib/schemas/field';

describe('port settings as found on site', () => {
  it('keeps only the settings given, without filling in defaults', () => {
    expect(foundPortSettingsSchema.parse({ baud: 19200, parity: 'even' })).toEqual({ baud: 19200, parity: 'even' });
    expect(foundPortSettingsSchema.parse({ nodeAddress: null, termination: false })).toEqual({ nodeAddress: null, termination: false });
  });

  it('refuses no settings at all, unknown settings, frame rules and values a port cannot have', () => {
    expect(foundPortSettingsSchema.safeParse({}).error?.issues[0]?.message).toBe('Give at least one setting you found, or leave the port out.');
    expect(foundPortSettingsSchema.safeParse({ baud: 9600, colour: 'red' }).success).toBe(false);
    expect(foundPortSettingsSchema.safeParse({ frameRules: { terminator: '0D' } }).success).toBe(false);
    expect(foundPortSettingsSchema.safeParse({ dataBits: 9 }).success).toBe(false);
    expect(foundPortSettingsSchema.safeParse({ stopBits: 3 }).success).toBe(false);
  });

  it('is optional on a finding, and a replacement takes firmware', () => {
    expect(fieldLogCreateSchema.parse({ kind: 'found-different', foundSettings: 'Parity odd' })).toMatchObject({ serialNumber: '', firmware: '' });
    expect(fieldLogCreateSchema.parse({ kind: 'replacement', newSerialNumber: 'QS23-01188', appliedVersion: 2, firmware: ' 2.2.0 ' })).toMatchObject({ firmware: '2.2.0' });
    expect(fieldLogCreateSchema.safeParse({ kind: 'verified', firmware: '1.0' }).success).toBe(false);
  });
});
