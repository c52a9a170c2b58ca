/** A field card's port: shorthand, facts and copy text in the words of src/lib/frame/port-text.ts, written out by hand. */
import { expect, it } from 'vitest';
import { cardPort } from '~/lib/field/card';
import { portSettingsBlock, portSettingsSchema } from '~/lib/frame';

it('an RS-485 port: line settings in words, termination and bias, and the full copy text', () => {
  const settings = portSettingsSchema.parse({
    interface: 'rs485-2w', baud: 19200, dataBits: 8, parity: 'even', stopBits: 1, protocol: 'modbus-rtu', nodeAddress: 7,
    rs485Direction: 'auto', termination: true, frameRules: { maxLength: 256 },
  });
  const card = cardPort({ id: 'p1', name: 'X3', settings, wiring: [{ pin: '1', signal: 'D+', colour: 'white' }], notes: '' }, 'DRV-7 Filler drive');
  expect(card.shorthand).toBe('19200 8-E-1');
  expect(card.facts).toEqual([
    { label: 'Interface', value: 'RS-485 2-wire' },
    { label: 'Baud', value: '19200' },
    { label: 'Data bits', value: '8' },
    { label: 'Parity', value: 'Even' },
    { label: 'Stop bits', value: '1' },
    { label: 'Handshake', value: 'None' },
    { label: 'RTS', value: 'Always off' },
    { label: 'CTS', value: 'Not checked' },
    { label: 'DTR', value: 'Always off' },
    { label: 'Hears own transmission', value: 'no' },
    { label: 'Node address', value: '7' },
    { label: 'Termination', value: 'ON' },
    { label: 'Bias', value: 'off' },
    { label: 'RS-485 direction', value: 'Automatic' },
    { label: 'Protocol', value: 'Modbus RTU' },
    { label: 'Response timeout', value: '1000 ms' },
    { label: 'Inter-character timeout', value: '0 ms' },
    { label: 'Turnaround delay', value: '0 ms' },
    { label: 'Retries', value: '0' },
    { label: 'Frame rules', value: 'max 256 bytes' },
  ]);
  expect(card.copyText).toBe([
    'DRV-7 Filler drive — X3',
    'Port: 19200 8-E-1',
    'Interface: RS-485 2-wire',
    'Baud rate: 19200',
    'Data bits: 8',
    'Parity: Even',
    'Stop bits: 1',
    'Handshake: None',
    'RTS: Always off',
    'CTS: Not checked',
    'DTR: Always off',
    'Hears own transmission: no',
    'Protocol: Modbus RTU',
    'Node address: 7',
    'RS-485 direction control: Automatic',
    'Termination: on',
    'Bias: off',
    'Response timeout: 1000 ms',
    'Inter-character timeout: 0 ms',
    'Turnaround delay: 0 ms',
    'Retries: 0',
    'Frame rules: max 256 bytes',
    'Wiring:',
    '  pin 1  D+  white',
  ].join('\n'));
});

it('a TCP port: the address as shorthand, no baud or framing', () => {
  const settings = portSettingsSchema.parse({ interface: 'tcp', tcpHost: '192.168.0.10', tcpPort: 502, baud: 19200, parity: 'even', protocol: 'modbus-rtu' });
  const card = cardPort({ id: 'p2', name: 'Ethernet', settings, wiring: [], notes: '' }, 'PLC-1');
  expect(card.shorthand).toBe('TCP 192.168.0.10:502');
  expect(card.facts).toEqual([
    { label: 'Interface', value: 'Serial over TCP' },
    { label: 'Node address', value: '—' },
    { label: 'Termination', value: 'n/a' },
    { label: 'Protocol', value: 'Modbus RTU' },
    { label: 'Response timeout', value: '1000 ms' },
    { label: 'Inter-character timeout', value: '0 ms' },
    { label: 'Turnaround delay', value: '0 ms' },
    { label: 'Retries', value: '0' },
  ]);
  expect(card.copyText.split('\n').slice(0, 5)).toEqual(['PLC-1 — Ethernet', 'Port: TCP 192.168.0.10:502', 'Interface: Serial over TCP', 'Baud rate: 19200', 'Data bits: 8']);
});

it('a PLC port with RTS on while sending: every control line, its lead and tail, and the copy is the vault text after the heading', () => {
  const settings = portSettingsSchema.parse({ interface: 'rs232', rtsMode: 'transmit', rtsLeadMs: 2, rtsTailMs: 2, retries: 3, turnaroundDelayMs: 5 });
  const card = cardPort({ id: 'p3', name: 'COM2', settings, wiring: [], notes: '' }, 'PLC-1');
  expect(card.facts.slice(5, 12)).toEqual([
    { label: 'Handshake', value: 'None' },
    { label: 'RTS', value: 'On while sending' },
    { label: 'CTS', value: 'Not checked' },
    { label: 'DTR', value: 'Always off' },
    { label: 'RTS lead', value: '2 ms' },
    { label: 'RTS tail', value: '2 ms' },
    { label: 'Hears own transmission', value: 'no' },
  ]);
  expect(card.facts.find((f) => f.label === 'Retries')).toEqual({ label: 'Retries', value: '3' });
  expect(card.facts.find((f) => f.label === 'Turnaround delay')).toEqual({ label: 'Turnaround delay', value: '5 ms' });
  expect(card.copyText).toBe(`PLC-1 — ${portSettingsBlock('COM2', settings, [])}`);
});
