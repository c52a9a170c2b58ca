/**
 * Port settings in words (src/lib/frame/port-text.ts): the shorthand, the labels and the full text. The
 * shorthand is common practice (baud, data bits, parity letter N/E/O/M/S, stop bits); every expected text
 * here is written out by hand.
 */
import { describe, expect, test } from 'vitest';
import { lineShorthand, portSettingsBlock, portSettingsSchema, portSettingsText, portShorthand, type PortSettingsInput } from '~/lib/frame';

const port = (s: PortSettingsInput) => portSettingsSchema.parse(s);

describe('line shorthand', () => {
  test('baud, data bits, parity letter and stop bits', () => {
    expect(lineShorthand({ baud: 9600, dataBits: 8, parity: 'none', stopBits: 1 })).toBe('9600 8-N-1');
    expect(lineShorthand({ baud: 9600, dataBits: 7, parity: 'even', stopBits: 1 })).toBe('9600 7-E-1');
    expect(lineShorthand({ baud: 19200, dataBits: 8, parity: 'none', stopBits: 2 })).toBe('19200 8-N-2');
    expect(lineShorthand({ baud: 19200, dataBits: 8, parity: 'even', stopBits: 1 })).toBe('19200 8-E-1');
    expect(lineShorthand({ baud: 1200, dataBits: 7, parity: 'odd', stopBits: 2 })).toBe('1200 7-O-2');
    expect(lineShorthand({ baud: 110, dataBits: 5, parity: 'none', stopBits: 1.5 })).toBe('110 5-N-1.5');
    expect(lineShorthand({ baud: 300, dataBits: 5, parity: 'mark', stopBits: 1.5 })).toBe('300 5-M-1.5');
    expect(lineShorthand({ baud: 9600, dataBits: 8, parity: 'space', stopBits: 1 })).toBe('9600 8-S-1');
    expect(lineShorthand({ baud: 115200, dataBits: 6, parity: 'odd', stopBits: 1 })).toBe('115200 6-O-1');
  });
});

describe('port shorthand', () => {
  test('a serial port reads as its line settings, whatever the interface', () => {
    expect(portShorthand(port({ interface: 'rs232' }))).toBe('9600 8-N-1');
    expect(portShorthand(port({ interface: 'rs485-2w', baud: 19200, parity: 'even' }))).toBe('19200 8-E-1');
    expect(portShorthand(port({ interface: 'rs485-4w', baud: 38400, dataBits: 7, parity: 'space', stopBits: 2 }))).toBe('38400 7-S-2');
    expect(portShorthand(port({ interface: 'usb-vcp', baud: 57600, stopBits: 1.5 }))).toBe('57600 8-N-1.5');
    expect(portShorthand(port({ interface: 'ttl', baud: 4800, parity: 'mark' }))).toBe('4800 8-M-1');
    // A TCP address left over from an earlier interface does not show on a serial port.
    expect(portShorthand(port({ interface: 'rs422', tcpHost: '10.0.0.5', tcpPort: 4001 }))).toBe('9600 8-N-1');
  });

  test('a TCP port reads as the address to connect to, not as baud and framing', () => {
    expect(portShorthand(port({ interface: 'tcp', tcpHost: '192.168.0.10', tcpPort: 502 }))).toBe('TCP 192.168.0.10:502');
    expect(portShorthand(port({ interface: 'tcp', tcpHost: 'gw-7.plant.test', tcpPort: 4001, baud: 19200, parity: 'even' }))).toBe('TCP gw-7.plant.test:4001');
    expect(portShorthand(port({ interface: 'tcp', tcpHost: '10.1.2.3', tcpPort: 65535 }))).toBe('TCP 10.1.2.3:65535');
  });

  test('a TCP port stored without its port number still names its host', () => {
    expect(portShorthand({ interface: 'tcp', tcpHost: '10.0.0.5', baud: 9600, dataBits: 8, parity: 'none', stopBits: 1 })).toBe('TCP 10.0.0.5');
    expect(portShorthand({ interface: 'tcp', baud: 9600, dataBits: 8, parity: 'none', stopBits: 1 })).toBe('TCP');
  });
});

describe('full settings text', () => {
  test('an RS-485 Modbus RTU port: line settings, address, direction control, termination and bias', () => {
    const text = portSettingsText(port({ interface: 'rs485-2w', baud: 19200, parity: 'even', nodeAddress: 5, rs485Direction: 'auto', termination: true, protocol: 'modbus-rtu' }));
    expect(text.split('\n')).toEqual([
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
      'Node address: 5',
      'RS-485 direction control: Automatic',
      'Termination: on',
      'Bias: off',
      'Response timeout: 1000 ms',
      'Inter-character timeout: 0 ms',
      'Turnaround delay: 0 ms',
      'Retries: 0',
    ]);
  });

  test('a TCP port: its address first, then the line settings of the serial side and the rest', () => {
    const text = portSettingsText(port({ interface: 'tcp', tcpHost: '192.168.0.10', tcpPort: 502, baud: 19200, protocol: 'modbus-rtu', nodeAddress: 1, responseTimeoutMs: 500, retries: 2 }));
    expect(text).toBe([
      'Port: TCP 192.168.0.10:502',
      'Interface: Serial over TCP',
      'Baud rate: 19200',
      'Data bits: 8',
      'Parity: None',
      'Stop bits: 1',
      'Handshake: None',
      'RTS: Always off',
      'CTS: Not checked',
      'DTR: Always off',
      'Hears own transmission: no',
      'Protocol: Modbus RTU',
      'Node address: 1',
      'Response timeout: 500 ms',
      'Inter-character timeout: 0 ms',
      'Turnaround delay: 0 ms',
      'Retries: 2',
    ].join('\n'));
  });

  test('each interface, parity, handshake and protocol in words', () => {
    const line = (s: PortSettingsInput, label: string) => portSettingsText(port(s)).split('\n').find((l) => l.startsWith(`${label}: `));
    const interfaces: [PortSettingsInput['interface'], string][] = [
      ['rs232', 'RS-232'], ['rs422', 'RS-422'], ['rs485-2w', 'RS-485 2-wire'], ['rs485-4w', 'RS-485 4-wire'],
      ['ttl', 'TTL UART'], ['usb-vcp', 'USB virtual COM port'],
    ];
    for (const [value, words] of interfaces) expect(line({ interface: value }, 'Interface')).toBe(`Interface: ${words}`);
    const parities: [PortSettingsInput['parity'], string][] = [['none', 'None'], ['even', 'Even'], ['odd', 'Odd'], ['mark', 'Mark'], ['space', 'Space']];
    for (const [value, words] of parities) expect(line({ parity: value }, 'Parity')).toBe(`Parity: ${words}`);
    const handshakes: [PortSettingsInput['handshake'], string][] = [['none', 'None'], ['rts-cts', 'RTS/CTS'], ['xon-xoff', 'XON/XOFF'], ['dtr-dsr', 'DTR/DSR']];
    for (const [value, words] of handshakes) expect(line({ handshake: value }, 'Handshake')).toBe(`Handshake: ${words}`);
    const protocols: [PortSettingsInput['protocol'], string][] = [['ascii', 'Delimited ASCII'], ['modbus-rtu', 'Modbus RTU'], ['modbus-ascii', 'Modbus ASCII'], ['other', 'Other']];
    for (const [value, words] of protocols) expect(line({ protocol: value }, 'Protocol')).toBe(`Protocol: ${words}`);
    const directions: [PortSettingsInput['rs485Direction'], string][] = [['none', 'None'], ['rts', 'RTS high while transmitting'], ['auto', 'Automatic']];
    for (const [value, words] of directions) expect(line({ interface: 'rs485-4w', rs485Direction: value }, 'RS-485 direction control')).toBe(`RS-485 direction control: ${words}`);
  });

  test('control lines: RTS, CTS and DTR in words; lead and tail when RTS is on while sending; echo', () => {
    const lines = (s: PortSettingsInput) => portSettingsText(port(s)).split('\n').filter((l) => /^(Handshake|RTS|CTS|DTR|Hears)/.test(l));
    expect(lines({ interface: 'rs485-2w', rtsMode: 'transmit', rtsLeadMs: 2, rtsTailMs: 1.5, echo: true })).toEqual([
      'Handshake: None',
      'RTS: On while sending',
      'CTS: Not checked',
      'DTR: Always off',
      'RTS lead: 2 ms',
      'RTS tail: 1.5 ms',
      'Hears own transmission: yes',
    ]);
    expect(lines({ handshake: 'rts-cts' })).toEqual([
      'Handshake: RTS/CTS', 'RTS: Flow control (on while ready to receive)', 'CTS: Sends only while CTS is on', 'DTR: Always off', 'Hears own transmission: no',
    ]);
    expect(lines({ dtrMode: 'flow' })).toEqual(['Handshake: DTR/DSR', 'RTS: Always off', 'CTS: Not checked', 'DTR: Flow control (with DSR)', 'Hears own transmission: no']);
    expect(lines({ rtsMode: 'on', dtrMode: 'on', ctsMode: 'gate' })).toEqual(['Handshake: None', 'RTS: Always on', 'CTS: Sends only while CTS is on', 'DTR: Always on', 'Hears own transmission: no']);
    // A lead or tail left from RS-485 shows even when RTS no longer switches.
    expect(lines({ rtsLeadMs: 3 })).toContain('RTS lead: 3 ms');
  });

  test('the copy block: heading, settings, frame rules and wiring', () => {
    const s = port({
      interface: 'rs232', baud: 9600, dataBits: 7, parity: 'even', stopBits: 1, handshake: 'xon-xoff', protocol: 'ascii',
      frameRules: { start: '02', terminator: '0D 0A', maxLength: 32, byteSet: 'printable', letterCase: 'upper' },
    });
    const wiring = [{ pin: '2', signal: 'RxD', colour: 'brown' }, { pin: '', signal: '', colour: '' }, { pin: '5', signal: 'GND', colour: '' }];
    expect(portSettingsBlock('COM1', s, wiring, 'PLC-1 Filler')).toBe([
      'PLC-1 Filler — COM1',
      'Port: 9600 7-E-1',
      'Interface: RS-232',
      'Baud rate: 9600',
      'Data bits: 7',
      'Parity: Even',
      'Stop bits: 1',
      'Handshake: XON/XOFF',
      'RTS: Always off',
      'CTS: Not checked',
      'DTR: Always off',
      'Hears own transmission: no',
      'Protocol: Delimited ASCII',
      'Response timeout: 1000 ms',
      'Inter-character timeout: 0 ms',
      'Turnaround delay: 0 ms',
      'Retries: 0',
      'Frame rules: start 02, terminator 0D 0A, max 32 bytes, printable bytes, upper case',
      'Wiring:',
      '  pin 2  RxD  brown',
      '  pin -  -',
      '  pin 5  GND',
    ].join('\n'));
  });

  test('the copy block without heading, frame rules or wiring is the name and the settings', () => {
    const s = port({ interface: 'rs232', baud: 4800, stopBits: 2, frameRules: { byteSet: '7-bit', letterCase: 'lower' } });
    expect(portSettingsBlock('Service', s, []).split('\n')).toEqual([
      'Service',
      'Port: 4800 8-N-2',
      'Interface: RS-232',
      'Baud rate: 4800',
      'Data bits: 8',
      'Parity: None',
      'Stop bits: 2',
      'Handshake: None',
      'RTS: Always off',
      'CTS: Not checked',
      'DTR: Always off',
      'Hears own transmission: no',
      'Protocol: Delimited ASCII',
      'Response timeout: 1000 ms',
      'Inter-character timeout: 0 ms',
      'Turnaround delay: 0 ms',
      'Retries: 0',
      'Frame rules: 7-bit bytes, lower case',
    ]);
    expect(portSettingsBlock('Plain', port({}), [])).not.toContain('Frame rules');
  });
});
