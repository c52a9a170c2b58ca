import { describe, expect, test } from 'vitest';
import { STANDARD_BAUD_RATES, alignControlLines, defaultPortSettings, portSettingsSchema, portShorthand, type PortSettingsInput } from '~/lib/frame';

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

describe('control lines and the older keys (docs/decisions/013)', () => {
  const lines = (s: PortSettingsInput) => {
    const p = portSettingsSchema.parse(s);
    return [p.handshake, p.rs485Direction, p.rtsMode, p.ctsMode, p.dtrMode];
  };
  test('defaults: RTS and DTR off, CTS not checked, no lead, tail or echo', () => {
    expect(defaultPortSettings).toMatchObject({ rtsMode: 'off', ctsMode: 'ignore', dtrMode: 'off', rtsLeadMs: 0, rtsTailMs: 0, echo: false });
  });
  test('a body with only the older keys gets the control lines they mean', () => {
    expect(lines({ handshake: 'rts-cts' })).toEqual(['rts-cts', 'none', 'flow', 'gate', 'off']);
    expect(lines({ handshake: 'dtr-dsr' })).toEqual(['dtr-dsr', 'none', 'off', 'ignore', 'flow']);
    expect(lines({ handshake: 'xon-xoff' })).toEqual(['xon-xoff', 'none', 'off', 'ignore', 'off']);
    expect(lines({ interface: 'rs485-2w', rs485Direction: 'rts' })).toEqual(['none', 'rts', 'transmit', 'ignore', 'off']);
    expect(lines({ interface: 'rs485-2w', rs485Direction: 'auto' })).toEqual(['none', 'auto', 'off', 'ignore', 'off']);
  });
  test('a body with only the control lines gets the older keys they mean', () => {
    expect(lines({ rtsMode: 'flow', ctsMode: 'gate' })).toEqual(['rts-cts', 'none', 'flow', 'gate', 'off']);
    expect(lines({ dtrMode: 'flow' })).toEqual(['dtr-dsr', 'none', 'off', 'ignore', 'flow']);
    expect(lines({ rtsMode: 'transmit' })).toEqual(['none', 'rts', 'transmit', 'ignore', 'off']);
    // Half of RTS/CTS is no handshake of the older kind.
    expect(lines({ rtsMode: 'flow' })).toEqual(['none', 'none', 'flow', 'ignore', 'off']);
    expect(lines({ ctsMode: 'gate', rtsMode: 'on' })).toEqual(['none', 'none', 'on', 'gate', 'off']);
  });
  test('keys that agree pass; keys that disagree are refused with a message naming both', () => {
    expect(lines({ handshake: 'rts-cts', rtsMode: 'flow', ctsMode: 'gate' })).toEqual(['rts-cts', 'none', 'flow', 'gate', 'off']);
    expect(lines({ handshake: 'xon-xoff', rtsMode: 'on' })).toEqual(['xon-xoff', 'none', 'on', 'ignore', 'off']);
    expect(lines({ rs485Direction: 'auto', rtsMode: 'on' })).toEqual(['none', 'auto', 'on', 'ignore', 'off']);
    const refused = (s: PortSettingsInput) => portSettingsSchema.safeParse(s).error?.issues.map((i) => [i.path.join('.'), i.message]);
    expect(refused({ handshake: 'rts-cts', rtsMode: 'transmit' })).toEqual([['handshake', 'handshake "rts-cts" needs RTS for flow control (rtsMode "flow"), but rs485Direction "rts" (rtsMode "transmit") raises it while transmitting; RTS does one or the other, not both.']]);
    expect(refused({ handshake: 'rts-cts', ctsMode: 'ignore' })).toEqual([['handshake', 'handshake "rts-cts" disagrees with rtsMode "flow" and ctsMode "ignore" (which mean handshake "none"). Send the same choice in both, or only one of them.']]);
    expect(refused({ handshake: 'none', dtrMode: 'flow' })).toEqual([['handshake', 'handshake "none" disagrees with dtrMode "flow" (which mean handshake "dtr-dsr"). Send the same choice in both, or only one of them.']]);
    expect(refused({ rs485Direction: 'auto', rtsMode: 'transmit' })).toEqual([['rs485Direction', 'rs485Direction "auto" disagrees with rtsMode "transmit" (rs485Direction "rts" is rtsMode "transmit"). Send the same choice in both, or only one of them.']]);
    expect(refused({ rs485Direction: 'rts', rtsMode: 'off' })?.[0]?.[0]).toBe('rs485Direction');
    expect(refused({ handshake: 'rts-cts', rs485Direction: 'rts' })).toEqual([['handshake', 'handshake "rts-cts" needs RTS for flow control (rtsMode "flow"), but rs485Direction "rts" (rtsMode "transmit") raises it while transmitting; RTS does one or the other, not both.']]);
    expect(refused({ handshake: 'rts-cts', rs485Direction: 'rts', rtsMode: 'flow' })?.[0]?.[0]).toBe('handshake');
  });
  test('lead and tail: milliseconds from 0 to 1000; echo is a yes or no', () => {
    expect(portSettingsSchema.safeParse({ rtsLeadMs: -1 }).success).toBe(false);
    expect(portSettingsSchema.safeParse({ rtsTailMs: 1000.5 }).success).toBe(false);
    expect(portSettingsSchema.safeParse({ rtsLeadMs: 1000, rtsTailMs: 0.5 }).success).toBe(true);
    expect(portSettingsSchema.safeParse({ echo: 'yes' }).success).toBe(false);
    expect(portSettingsSchema.safeParse({ rtsMode: 'sometimes' }).error?.issues.map((i) => i.path.join('.'))).toEqual(['rtsMode']);
  });
});

describe('the form keeps both sides in step (alignControlLines)', () => {
  const start = { handshake: 'none', rs485Direction: 'none', rtsMode: 'off', ctsMode: 'ignore', dtrMode: 'off' } as const;
  test('choosing a handshake sets the lines it means; leaving it clears them', () => {
    const rtsCts = alignControlLines({ ...start, handshake: 'rts-cts' }, 'handshake');
    expect(rtsCts).toEqual({ handshake: 'rts-cts', rs485Direction: 'none', rtsMode: 'flow', ctsMode: 'gate', dtrMode: 'off' });
    expect(alignControlLines({ ...rtsCts, handshake: 'xon-xoff' }, 'handshake')).toEqual({ ...start, handshake: 'xon-xoff' });
    expect(alignControlLines({ ...rtsCts, handshake: 'dtr-dsr' }, 'handshake')).toEqual({ ...start, handshake: 'dtr-dsr', dtrMode: 'flow' });
    // RTS always on stays when the handshake changes to one that does not use RTS.
    expect(alignControlLines({ ...start, rtsMode: 'on', handshake: 'xon-xoff' }, 'handshake')).toEqual({ ...start, rtsMode: 'on', handshake: 'xon-xoff' });
    // RTS/CTS takes RTS from RS-485 direction control.
    expect(alignControlLines({ ...start, rs485Direction: 'rts', rtsMode: 'transmit', handshake: 'rts-cts' }, 'handshake'))
      .toEqual({ handshake: 'rts-cts', rs485Direction: 'none', rtsMode: 'flow', ctsMode: 'gate', dtrMode: 'off' });
  });
  test('RS-485 direction by RTS sets RTS on while sending; leaving it switches RTS off', () => {
    const rts = alignControlLines({ ...start, rs485Direction: 'rts' }, 'rs485Direction');
    expect(rts).toEqual({ ...start, rs485Direction: 'rts', rtsMode: 'transmit' });
    expect(alignControlLines({ ...rts, rs485Direction: 'auto' }, 'rs485Direction')).toEqual({ ...start, rs485Direction: 'auto' });
  });
  test('a changed line gives the older keys it means', () => {
    expect(alignControlLines({ ...start, rtsMode: 'transmit' }, 'rtsMode')).toEqual({ ...start, rtsMode: 'transmit', rs485Direction: 'rts' });
    expect(alignControlLines({ ...start, rtsMode: 'flow', ctsMode: 'gate' }, 'ctsMode')).toEqual({ ...start, rtsMode: 'flow', ctsMode: 'gate', handshake: 'rts-cts' });
    expect(alignControlLines({ ...start, handshake: 'rts-cts', rtsMode: 'flow', ctsMode: 'ignore' }, 'ctsMode')).toEqual({ ...start, rtsMode: 'flow' });
    expect(alignControlLines({ ...start, handshake: 'xon-xoff', dtrMode: 'on' }, 'dtrMode')).toEqual({ ...start, handshake: 'xon-xoff', dtrMode: 'on' });
    expect(alignControlLines({ ...start, rs485Direction: 'rts', rtsMode: 'on' }, 'rtsMode')).toEqual({ ...start, rtsMode: 'on' });
  });
});
