import { expect, test } from 'vitest';
import { STANDARD_BAUD_RATES, defaultPortSettings, portSettingsSchema, portShorthand } from '~/lib/frame';

test('defaults: 9600 8-N-1 on RS-232 without handshake', () => {
  // common practice port setting: 9600 baud, 8 data bits, no parity, 1 stop bit
  expect(portShorthand(defaultPortSettings)).toBe('9600 8-N-1');
  expect(portSettingsSchema.parse({})).toEqual(defaultPortSettings);
  expect(defaultPortSettings).toMatchObject({ interface: 'rs232', handshake: 'none' });
});

test('schema limits', () => {
  expect(portSettingsSchema.safeParse({ baud: 0 }).success).toBe(false);
  expect(portSettingsSchema.safeParse({ baud: 9600.5 }).success).toBe(false);
  expect(portSettingsSchema.safeParse({ dataBits: 9 }).success).toBe(false);
  expect(portSettingsSchema.safeParse({ dataBits: 4 }).success).toBe(false);
  expect(portSettingsSchema.safeParse({ stopBits: 3 }).success).toBe(false);
  expect(portSettingsSchema.safeParse({ interface: 'tcp' }).success).toBe(false);
  expect(portSettingsSchema.safeParse({ interface: 'tcp', tcpHost: '10.0.0.5', tcpPort: 4001 }).success).toBe(true);
  expect(STANDARD_BAUD_RATES[0]).toBe(300);
  expect(STANDARD_BAUD_RATES.at(-1)).toBe(921600);
  expect(STANDARD_BAUD_RATES).toContain(9600);
});
