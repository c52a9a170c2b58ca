import { describe, expect, it } from 'vitest';
import { openPlan, serialUnavailable, isRecoverableReadError, LINK_BUFFER_BYTES } from '../../src/lib/live/serial';
import { portSettingsSchema, type PortSettingsInput } from '../../src/lib/frame';

const plan = (s: PortSettingsInput) => openPlan(portSettingsSchema.parse(s));

describe('opening a stored port from the browser', () => {
  it('maps the line settings to the options of port.open (W3C Web Serial SerialOptions)', () => {
    expect(plan({ baud: 9600 })).toEqual({ ok: true, warnings: [], options: { baudRate: 9600, dataBits: 8, stopBits: 1, parity: 'none', flowControl: 'none', bufferSize: LINK_BUFFER_BYTES } });
    expect(plan({ baud: 19200, dataBits: 7, parity: 'even', stopBits: 2, handshake: 'rts-cts' })).toMatchObject({ ok: true, options: { baudRate: 19200, dataBits: 7, parity: 'even', stopBits: 2, flowControl: 'hardware' } });
    expect(plan({ parity: 'odd' })).toMatchObject({ ok: true, options: { parity: 'odd' } });
  });

  it('refuses what Web Serial cannot open, saying what and why, every reason at once', () => {
    const r = plan({ dataBits: 5, parity: 'mark', stopBits: 1.5, handshake: 'xon-xoff' });
    expect(r.ok).toBe(false);
    if (r.ok) return;
    expect(r.problems).toHaveLength(4);
    expect(r.problems[0]).toBe('9600 5-M-1.5: browsers open 7 or 8 data bits only, not 5.');
    expect(r.problems[1]).toMatch(/parity none, even or odd only, not mark/);
    expect(r.problems[2]).toMatch(/1 or 2 stop bits only, not 1.5/);
    expect(r.problems[3]).toMatch(/XON\/XOFF/);
    expect(plan({ dataBits: 6 })).toMatchObject({ ok: false, problems: [expect.stringMatching(/not 6/)] });
    expect(plan({ parity: 'space' })).toMatchObject({ ok: false, problems: [expect.stringMatching(/not space/)] });
    expect(plan({ handshake: 'dtr-dsr' })).toMatchObject({ ok: false, problems: [expect.stringMatching(/RTS\/CTS only/)] });
    expect(plan({ interface: 'tcp', tcpHost: '192.168.0.10', tcpPort: 502 })).toMatchObject({ ok: false, problems: [expect.stringMatching(/TCP/)] });
  });

  it('warns that RTS from the browser cannot drive an RS-485 transmitter direction', () => {
    const r = plan({ interface: 'rs485-2w', rs485Direction: 'rts' });
    expect(r).toMatchObject({ ok: true, warnings: [expect.stringMatching(/too slow/)] });
    expect(plan({ interface: 'rs485-2w', rs485Direction: 'auto' })).toMatchObject({ ok: true, warnings: [] });
  });

  it('says why a page cannot reach serial ports', () => {
    expect(serialUnavailable({ serial: {}, isSecureContext: true })).toBeNull();
    expect(serialUnavailable({ serial: undefined, isSecureContext: true })).toMatch(/no Web Serial API/);
    expect(serialUnavailable({ serial: {}, isSecureContext: false })).toMatch(/not in a secure context/);
  });

  it('knows which read errors the stream recovers from', () => {
    expect(isRecoverableReadError(new DOMException('x', 'FramingError'))).toBe(true);
    expect(isRecoverableReadError(new DOMException('x', 'ParityError'))).toBe(true);
    expect(isRecoverableReadError(new DOMException('x', 'NetworkError'))).toBe(false);
    expect(isRecoverableReadError(null)).toBe(false);
  });
});
