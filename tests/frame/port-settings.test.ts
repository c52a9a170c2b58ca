import { expect, test } from 'vitest';
import { STANDARD_BAUD_RATES, defaultPortSettings, portSettingsSchema, portSettingsText, portShorthand } from '~/lib/frame';

test('defaults: 9600 8-N-1 on RS-232 without handshake', () => {
  // common practice port setting: 9600 baud, 8 data bits, no parity, 1 stop bit
  expect(portShorthand(defaultPortSettings)).toBe('9600 8-N-1');
  expect(portSettingsSchema.parse({})).toEqual(defaultPortSettings);
  expect(defaultPortSettings).toMatchObject({ interface: 'rs232', handshake: 'none' });
});

test('shorthand parity letters and stop bits', () => {
  // common practice shorthand: baud, data bits, parity letter N/E/O/M/S, stop bits
  expect(portShorthand({ baud: 19200, dataBits: 8, parity: 'even', stopBits: 1 })).toBe('19200 8-E-1');
  expect(portShorthand({ baud: 1200, dataBits: 7, parity: 'odd', stopBits: 2 })).toBe('1200 7-O-2');
  expect(portShorthand({ baud: 300, dataBits: 5, parity: 'mark', stopBits: 1.5 })).toBe('300 5-M-1.5');
  expect(portShorthand({ baud: 9600, dataBits: 8, parity: 'space', stopBits: 1 })).toBe('9600 8-S-1');
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

test('plain text block for copying', () => {
  const text = portSettingsText(portSettingsSchema.parse({ interface: 'rs485-2w', baud: 19200, parity: 'even', nodeAddress: 5, rs485Direction: 'auto', termination: true, protocol: 'modbus-rtu' }));
  expect(text.split('\n').slice(0, 9)).toEqual([
    'Port: 19200 8-E-1',
    'Interface: RS-485 2-wire',
    'Baud rate: 19200',
    'Data bits: 8',
    'Parity: even',
    'Stop bits: 1',
    'Handshake: none',
    'Protocol: Modbus RTU',
    'Node address: 5',
  ]);
  expect(text).toContain('Termination: on');
});
