import { describe, expect, test } from 'vitest';
import { type LinkMember, type PortSettings, type PortSettingsInput, checkLink, defaultPortSettings, portSettingsSchema } from '~/lib/frame';

const port = (p: Partial<PortSettings> = {}): PortSettings => ({ ...defaultPortSettings, ...p });
const rs485 = (p: Partial<PortSettings> = {}) => port({ interface: 'rs485-2w', rs485Direction: 'auto', protocol: 'modbus-rtu', ...p });
const member = (id: string, role: LinkMember['role'], settings: PortSettings, extra: Partial<LinkMember> = {}): LinkMember => ({ id, label: id.toUpperCase(), role, settings, ...extra });
const codes = (r: ReturnType<typeof checkLink>) => r.findings.map((f) => `${f.code}${f.memberId ? '@' + f.memberId : ''}`);

/** A correct 3-device bus: master and the far slave at the cable ends, terminated; master biases. */
const goodBus = () => [
  member('plc', 'master', rs485({ termination: true, bias: true }), { isEnd: true }),
  member('drive', 'slave', rs485({ nodeAddress: 1 }), { isEnd: false }),
  member('scale', 'slave', rs485({ nodeAddress: 2, termination: true }), { isEnd: true }),
];

describe('settings mismatches', () => {
  test('a matching point-to-point link is ok', () => {
    // common practice port setting: 9600 baud, 8 data bits, no parity, 1 stop bit
    expect(checkLink([member('a', 'master', port()), member('b', 'slave', port())], { kind: 'point-to-point' })).toEqual({ state: 'ok', findings: [] });
  });
  test('each of baud, data bits, parity, stop bits, handshake, protocol', () => {
    const b = port({ baud: 19200, dataBits: 7, parity: 'even', stopBits: 2, handshake: 'rts-cts', protocol: 'other' });
    const r = checkLink([member('a', 'master', port()), member('b', 'slave', b)], { kind: 'point-to-point' });
    expect(codes(r)).toEqual(['baud-mismatch@b', 'data-bits-mismatch@b', 'parity-mismatch@b', 'stop-bits-mismatch@b', 'handshake-mismatch@b', 'protocol-mismatch@b']);
    expect(r.state).toBe('error');
    expect(r.findings[0]!.message).toBe('B: set the baud rate to 9600 to match A (9600 8-N-1).');
  });
  test('RS-232 to RS-485 needs a converter', () => {
    const r = checkLink([member('a', 'master', port()), member('b', 'slave', rs485({ protocol: 'ascii' }))], { kind: 'point-to-point' });
    expect(codes(r)).toEqual(['interface-mismatch@b']);
    expect(r.findings[0]!.message).toContain('converter');
    // RS-422 and 4-wire RS-485 are electrically compatible (common practice)
    expect(codes(checkLink([member('a', 'peer', port({ interface: 'rs422' })), member('b', 'peer', port({ interface: 'rs485-4w' }))], { kind: 'point-to-point' }))).toEqual([]);
    expect(codes(checkLink([...goodBus(), member('x', 'slave', port({ protocol: 'modbus-rtu', nodeAddress: 3 }))], { kind: 'rs485-bus' }))).toEqual(['interface-mismatch@x']);
  });
});

describe('RS-485 bus rules', () => {
  test('a correct bus is ok', () => {
    expect(checkLink(goodBus(), { kind: 'rs485-bus', cableLengthM: 100 })).toEqual({ state: 'ok', findings: [] });
  });
  test('duplicate and out-of-range Modbus addresses', () => {
    // Modbus over Serial Line guide V1.02, 2.2: 0 broadcast, 1-247 devices, 248-255 reserved
    const bus = goodBus();
    bus[2]!.settings = rs485({ nodeAddress: 1, termination: true });
    expect(codes(checkLink(bus, { kind: 'rs485-bus' }))).toEqual(['address-duplicate@scale']);
    for (const [addr, expected] of [[0, ['address-out-of-range@drive']], [247, []], [248, ['address-out-of-range@drive']], [255, ['address-out-of-range@drive']]] as const) {
      const b = goodBus();
      b[1]!.settings = rs485({ nodeAddress: addr });
      expect(codes(checkLink(b, { kind: 'rs485-bus' }))).toEqual(expected);
    }
    const missing = goodBus();
    missing[1]!.settings = rs485({ nodeAddress: null });
    expect(codes(checkLink(missing, { kind: 'rs485-bus' }))).toEqual(['address-missing@drive']);
  });
  test('no direction control on a 2-wire transmitter', () => {
    const bus = goodBus();
    bus[1]!.settings = rs485({ nodeAddress: 1, rs485Direction: 'none' });
    expect(codes(checkLink(bus, { kind: 'rs485-bus' }))).toEqual(['no-direction-control@drive']);
  });
  test('termination at exactly the two cable ends', () => {
    // RS-485 transceiver datasheet guidance in the shared reference list (terminate each cable end, typically 120 Ω); Modbus guide V1.02, 3.4
    const bus = goodBus();
    bus[0]!.settings = rs485({ bias: true });
    bus[1]!.settings = rs485({ nodeAddress: 1, termination: true });
    expect(codes(checkLink(bus, { kind: 'rs485-bus' }))).toEqual(['termination-missing@plc', 'termination-in-middle@drive']);
    const noEnds = goodBus().map((m) => ({ ...m, isEnd: undefined, settings: { ...m.settings, termination: true } }));
    expect(codes(checkLink(noEnds, { kind: 'rs485-bus' }))).toEqual(['termination-count']);
    expect(checkLink(noEnds, { kind: 'rs485-bus' }).state).toBe('error');
  });
  test('more than 32 unit loads', () => {
    // TIA-485-A: one driver drives 32 unit loads (transceiver datasheet "Bus Loading" section in the shared reference list)
    const bus = goodBus();
    bus[1]!.unitLoads = 30;
    expect(codes(checkLink(bus, { kind: 'rs485-bus' }))).toEqual([]); // 1 + 30 + 1 = 32
    bus[1]!.unitLoads = 31;
    expect(codes(checkLink(bus, { kind: 'rs485-bus' }))).toEqual(['too-many-unit-loads']);
  });
  test('length × rate ≤ 10^8 rule of thumb is a warning', () => {
    // common practice rule of thumb for RS-485 cable length versus bit rate
    const at = (m: number) => checkLink(goodBus(), { kind: 'rs485-bus', cableLengthM: m });
    expect(at(10416).findings).toEqual([]); // 10416 × 9600 = 99,993,600
    expect(at(10417)).toMatchObject({ state: 'warning', findings: [{ code: 'cable-too-long', severity: 'warning' }] });
  });
  test('bias, masters and member counts', () => {
    const bus = goodBus();
    bus[0]!.settings = rs485({ termination: true });
    expect(codes(checkLink(bus, { kind: 'rs485-bus' }))).toEqual(['bias-missing']); // Modbus guide V1.02, 3.4 line polarization (section recalled from memory)
    const two = goodBus();
    two[1]!.role = 'master';
    expect(codes(checkLink(two, { kind: 'rs485-bus' }))).toEqual(['multiple-masters@drive']);
    expect(codes(checkLink(goodBus().map((m) => ({ ...m, role: 'slave' as const })), { kind: 'rs485-bus' }))).toContain('no-master');
    expect(codes(checkLink(goodBus(), { kind: 'point-to-point' }))).toContain('too-many-members');
  });
});

describe('control lines', () => {
  // Settings as the API stores them: the older keys and the control lines agree (portSettingsSchema fills both).
  const line = (s: PortSettingsInput = {}) => portSettingsSchema.parse(s);
  const p2p = (a: PortSettings, b: PortSettings) => checkLink([member('a', 'master', a), member('b', 'slave', b)], { kind: 'point-to-point' });

  test('one end waits for CTS while the other never raises RTS', () => {
    const r = p2p(line({ ctsMode: 'gate' }), line());
    expect(codes(r)).toEqual(['cts-never-raised@a']);
    expect(r.state).toBe('error');
    expect(r.findings[0]!.message).toBe('A sends only while CTS is on, but B never raises RTS (RTS: Always off), so A waits to send. Set A\'s CTS to "Not checked", or B\'s RTS to flow control or always on.');
    expect(p2p(line(), line({ ctsMode: 'gate' })).findings.map((f) => f.code + '@' + f.memberId)).toEqual(['cts-never-raised@b']);
    expect(p2p(line({ ctsMode: 'gate' }), line({ rtsMode: 'transmit' })).findings[0]!.message).toContain('B raises RTS only while it is sending itself (RTS: On while sending)');
    expect(codes(p2p(line({ ctsMode: 'gate' }), line({ rtsMode: 'on' })))).toEqual([]);
    expect(codes(p2p(line({ ctsMode: 'gate' }), line({ rtsMode: 'flow' })))).toEqual([]);
    // On RS-485 and RS-422 the control lines do not run in the cable.
    expect(codes(p2p(line({ interface: 'rs422', ctsMode: 'gate' }), line({ interface: 'rs422' })))).toEqual([]);
  });

  test('hardware flow control on one end only', () => {
    const r = p2p(line({ handshake: 'rts-cts' }), line());
    expect(codes(r)).toEqual(['flow-one-end@b']);
    expect(r.findings[0]!.message).toBe('A uses RTS/CTS hardware flow control but B does not; one end then waits for a line the other never raises. Set both ends the same.');
    expect(p2p(line(), line({ rtsMode: 'flow', ctsMode: 'gate' })).findings[0]!.message).toMatch(/^B uses RTS\/CTS hardware flow control but A does not/);
    expect(p2p(line(), line({ dtrMode: 'flow' })).findings.map((f) => [f.code, f.message.slice(0, 40)])).toEqual([['flow-one-end', 'B uses DTR/DSR hardware flow control but']]);
    expect(codes(p2p(line({ handshake: 'rts-cts' }), line({ rtsMode: 'flow', ctsMode: 'gate' })))).toEqual([]);
    // Software flow control on one end is still a handshake mismatch.
    expect(codes(p2p(line({ handshake: 'xon-xoff' }), line()))).toEqual(['handshake-mismatch@b']);
  });

  test('2-wire RS-485: RTS on while sending or automatic direction counts as direction control', () => {
    const bus = (s: PortSettingsInput) => {
      const b = goodBus();
      b[1]!.settings = line({ interface: 'rs485-2w', protocol: 'modbus-rtu', nodeAddress: 1, ...s });
      return codes(checkLink(b, { kind: 'rs485-bus' }));
    };
    expect(bus({ rtsMode: 'transmit', rtsTailMs: 2 })).toEqual([]);
    expect(bus({ rs485Direction: 'auto' })).toEqual([]);
    expect(bus({})).toEqual(['no-direction-control@drive']);
    expect(bus({ rtsMode: 'on' })).toEqual(['no-direction-control@drive']);
  });

  test('an RTS tail shorter than one character time at the port\'s baud', () => {
    // Character time = bits per character ÷ baud (common practice): 8-N-1 is 10 bits, 1.0417 ms at 9600;
    // 8-E-1 is 11 bits, 0.5729 ms at 19200; 7-E-2 is 11 bits, 1.1458 ms at 9600.
    const tail = (s: PortSettingsInput) => checkLink([member('plc', 'master', line({ rtsMode: 'transmit', ...s }))], { kind: 'point-to-point' }).findings;
    const short = tail({ rtsTailMs: 1 });
    expect(short.map((f) => [f.severity, f.code, f.memberId])).toEqual([['warning', 'rts-tail-short', 'plc']]);
    expect(short[0]!.message).toBe('PLC drops RTS 1 ms after its transmit buffer empties, but the last character takes 1.04 ms to leave the line (10 bits at 9600 bit/s); a converter switched by RTS may cut off its last stop bit. Set the RTS tail to at least 1.05 ms. (Assumes the tail counts from when the transmit buffer empties; if the port counts it from the end of the stop bit, this does not apply.)');
    expect(tail({ rtsTailMs: 1.05 })).toEqual([]);
    expect(tail({ rtsTailMs: 0 }).map((f) => f.code)).toEqual(['rts-tail-short']);
    expect(tail({ baud: 19200, parity: 'even', rtsTailMs: 0.57 })[0]!.message).toContain('takes 0.57 ms to leave the line (11 bits at 19200 bit/s)');
    expect(tail({ baud: 19200, parity: 'even', rtsTailMs: 0.58 })).toEqual([]);
    expect(tail({ dataBits: 7, parity: 'even', stopBits: 2, rtsTailMs: 1.14 })[0]!.message).toContain('at least 1.15 ms');
    expect(tail({ dataBits: 7, parity: 'even', stopBits: 2, rtsTailMs: 1.15 })).toEqual([]);
    // No tail to speak of when RTS does not switch with sending.
    expect(checkLink([member('plc', 'master', line({ rtsMode: 'on' }))], { kind: 'point-to-point' }).findings).toEqual([]);
  });
});
