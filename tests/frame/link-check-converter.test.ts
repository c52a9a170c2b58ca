/** The link check across a converter: line settings compared end to end, direction control taken from the far side. */
import { describe, expect, test } from 'vitest';
import { type LinkMember, type PortSettings, checkLink, defaultPortSettings } from '~/lib/frame';

const port = (p: Partial<PortSettings> = {}): PortSettings => ({ ...defaultPortSettings, ...p });
// common practice for a PLC port talking to a converter: RTS raised while sending, CTS not checked, a tail longer
// than one character (10 bits at 9600 bit/s ≈ 1.04 ms)
const plcRs232 = (p: Partial<PortSettings> = {}) => port({ protocol: 'modbus-rtu', rtsMode: 'transmit', rs485Direction: 'rts', ctsMode: 'ignore', rtsTailMs: 2, ...p });
const rs485 = (p: Partial<PortSettings> = {}) => port({ interface: 'rs485-2w', rs485Direction: 'auto', protocol: 'modbus-rtu', ...p });
const member = (id: string, role: LinkMember['role'], settings: PortSettings, extra: Partial<LinkMember> = {}): LinkMember => ({ id, label: id.toUpperCase(), role, settings, ...extra });
const codes = (r: ReturnType<typeof checkLink>) => r.findings.map((f) => `${f.code}${f.memberId ? '@' + f.memberId : ''}`);

/**
 * PLC RS-232 ── link A ── CV RS-232 ⇄ CV RS-485 ── link B (bus) ── DRV1, DRV2.
 * `cv485` and the drives are given so each test can change one setting.
 */
function chain(o: { plc?: Partial<PortSettings>; cv232?: Partial<PortSettings>; cv485?: Partial<PortSettings>; drv1?: Partial<PortSettings> } = {}) {
  const plc = member('plc', 'master', plcRs232(o.plc));
  const cv232 = member('cv232', 'slave', port({ protocol: 'modbus-rtu', ...o.cv232 }));
  const cv485 = member('cv485', 'master', rs485({ termination: true, bias: true, ...o.cv485 }), { isEnd: true });
  const drv1 = member('drv1', 'slave', rs485({ nodeAddress: 1, ...o.drv1 }), { isEnd: false });
  const drv2 = member('drv2', 'slave', rs485({ nodeAddress: 2, termination: true }), { isEnd: true });
  const linkA = [plc, { ...cv232, bridge: { via: 'CV-430', other: cv485, beyond: [drv1, drv2] } }];
  const linkB = [{ ...cv485, bridge: { via: 'CV-430', other: cv232, beyond: [plc] } }, drv1, drv2];
  return { a: checkLink(linkA, { kind: 'point-to-point' }), b: checkLink(linkB, { kind: 'rs485-bus' }) };
}

describe('a converter between an RS-232 port and an RS-485 bus', () => {
  test('settings that agree end to end: both links agree', () => {
    const { a, b } = chain();
    expect(a).toEqual({ state: 'ok', findings: [] });
    expect(b).toEqual({ state: 'ok', findings: [] });
  });

  test('a drive beyond the converter with another baud rate shows on the PLC side too, named through the converter', () => {
    const { a, b } = chain({ drv1: { baud: 19200 } });
    expect(codes(a)).toEqual(['baud-mismatch@drv1']);
    expect(a.findings[0]!.message).toBe('DRV1 (through CV-430): set the baud rate to 9600 to match PLC (9600 8-N-1).');
    expect(codes(b)).toEqual(['baud-mismatch@drv1']);
  });

  test('parity, stop bits, data bits and protocol are compared across the bridge; the interface is not', () => {
    const { a } = chain({ drv1: { parity: 'even', stopBits: 2, dataBits: 7, protocol: 'ascii' } });
    expect(codes(a)).toEqual(['data-bits-mismatch@drv1', 'parity-mismatch@drv1', 'stop-bits-mismatch@drv1', 'protocol-mismatch@drv1']);
    // the PLC is RS-232 and the drives RS-485: no interface finding on either link
    expect(chain().a.findings.some((f) => f.code === 'interface-mismatch')).toBe(false);
  });

  test('a PLC with another baud rate shows on the bus, named through the converter', () => {
    const { a, b } = chain({ plc: { baud: 19200 } });
    expect(codes(b)).toEqual(['baud-mismatch@plc']);
    expect(b.findings[0]!.message).toContain('PLC (through CV-430): set the baud rate to 9600');
    expect(codes(a)).toContain('baud-mismatch@cv232');
  });

  test('without a converter, RS-232 wired to RS-485 still asks for one', () => {
    const r = checkLink([member('plc', 'master', plcRs232()), member('drv1', 'slave', rs485({ nodeAddress: 1 }))], { kind: 'point-to-point' });
    expect(codes(r)).toEqual(['interface-mismatch@drv1']);
    expect(r.findings[0]!.message).toBe('DRV1 is 2-wire RS-485 but PLC is RS-232; put a RS-232 to 2-wire RS-485 converter between them.');
  });
});

describe('direction control of a converter on 2-wire RS-485', () => {
  test('automatic direction switching needs nothing from the PLC', () => {
    const { b } = chain({ plc: { rtsMode: 'off', rs485Direction: 'none' } });
    expect(codes(b)).toEqual([]);
  });
  test('switched by RTS: agrees while the PLC raises RTS while sending', () => {
    const { b } = chain({ cv485: { rs485Direction: 'rts', rtsMode: 'transmit' } });
    expect(codes(b)).toEqual([]);
  });
  test('switched by RTS, with a PLC that never raises RTS: no direction control, on the converter', () => {
    const { b } = chain({ cv485: { rs485Direction: 'rts', rtsMode: 'transmit' }, plc: { rtsMode: 'off', rs485Direction: 'none' } });
    expect(codes(b)).toEqual(['no-direction-control@cv485']);
    expect(b.findings[0]!.message).toContain('PLC does not raise RTS while sending (RTS: Always off)');
    expect(b.findings[0]!.message).toContain('set CV-430 to switch direction automatically');
  });
  test('neither automatic nor RTS: the usual finding', () => {
    const { b } = chain({ cv485: { rs485Direction: 'none', rtsMode: 'off' } });
    expect(codes(b)).toEqual(['no-direction-control@cv485']);
    expect(b.findings[0]!.message).toContain('no direction control');
  });
  test('the converter port itself is not warned about its RTS tail (the PLC is, on its own link)', () => {
    const { a, b } = chain({ cv485: { rs485Direction: 'rts', rtsMode: 'transmit', rtsTailMs: 0 }, plc: { rtsTailMs: 0 } });
    expect(codes(b)).toEqual([]);
    expect(codes(a)).toEqual(['rts-tail-short@plc']);
  });
});
