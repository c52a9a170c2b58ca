import { describe, expect, it } from 'vitest';
import { createFakeSerial } from '../../src/lib/live/fake-serial';
import { LiveLink } from '../../src/lib/live/session';
import { runFramingSearch, searchCandidates, searchQueries, searchRefusal } from '../../src/lib/live/framing-search';
import { indexAckTemplate, indexMoveTemplate, statusQueryTemplate, statusReplyTemplate } from '../../src/lib/composer/demo';
import { latin1Bytes, portSettingsSchema } from '../../src/lib/frame';

const ascii = (s: string) => latin1Bytes(s) as Uint8Array;
const commands = [
  { id: 'idx', name: 'Index 45°', template: indexMoveTemplate, replyTemplate: indexAckTemplate },
  { id: 'sta', name: 'Status query', template: statusQueryTemplate, replyTemplate: statusReplyTemplate },
];
const settings = portSettingsSchema.parse({ baud: 9600, responseTimeoutMs: 100, frameRules: { terminator: '0D' } });
const query = { name: 'Status query', movesMachinery: false, safeToRepeat: true, request: ascii('1?STA*48\r'), replyTemplate: statusReplyTemplate };

describe('framing search', () => {
  it('lists the port framing first, then 8 baud rates × 3 parities × 2 stop bits at 8 data bits, each once', () => {
    const c = searchCandidates({ baud: 9600, dataBits: 8, parity: 'none', stopBits: 1 });
    expect(c).toHaveLength(48);
    expect(c[0]).toEqual({ baud: 9600, dataBits: 8, parity: 'none', stopBits: 1 });
    expect(searchCandidates({ baud: 300, dataBits: 7, parity: 'even', stopBits: 1 })).toHaveLength(49);
  });

  it('finds a device at 19200 8-E-1; 8-E-2 answers too, as receivers check only the first stop bit', async () => {
    const serial = createFakeSerial({ line: { baud: 19200, dataBits: 8, parity: 'even', stopBits: 1 }, commands, responseDelayMs: 1 });
    const port = await serial.requestPort();
    const candidates = [9600, 19200].flatMap((baud) => (['none', 'even', 'odd'] as const).flatMap((parity) => ([1, 2] as const).map((stopBits) => ({ baud, dataBits: 8, parity, stopBits }))));
    const results = await runFramingSearch(query, { port, settings, open: (p, s) => LiveLink.open(p, s) }, candidates);
    expect(results.filter((r) => r.outcome === 'answered').map((r) => r.shorthand)).toEqual(['19200 8-E-1', '19200 8-E-2']);
    expect(results.filter((r) => r.outcome === 'garbled').length).toBe(10);
    expect(serial.evidence.written.every((w) => String.fromCharCode(...w) === '1?STA*48\r')).toBe(true);
    expect(serial.evidence.opened.map((o) => o.baudRate)).toEqual(candidates.map((c) => c.baud));
  });

  it('never sends a command that moves machinery (even one marked safe to repeat), nor one not marked, nor one without a reply template', async () => {
    const serial = createFakeSerial({ line: { baud: 9600, dataBits: 8, parity: 'none', stopBits: 1 }, commands });
    const port = await serial.requestPort();
    const move = { name: 'Index 45°', movesMachinery: true, safeToRepeat: true, request: ascii('1!IDX:+4500/R180000/F180000/S18000\r'), replyTemplate: indexAckTemplate };
    await expect(runFramingSearch(move, { port, settings, open: (p, s) => LiveLink.open(p, s) })).rejects.toThrow(/moves machinery/);
    await expect(runFramingSearch({ ...query, safeToRepeat: false }, { port, settings, open: (p, s) => LiveLink.open(p, s) })).rejects.toThrow(/not marked safe to repeat/);
    expect(searchRefusal({ ...query, replyTemplate: null })).toMatch(/no reply template/);
    expect(serial.evidence.opened).toEqual([]);
    expect(serial.evidence.written).toEqual([]);
  });

  it('offers as the query only commands marked safe to repeat, with a reply template, that move nothing and are not sequences, in library order', () => {
    const c = (name: string, over: Partial<{ movesMachinery: boolean; safeToRepeat: boolean; sequence: unknown }> = {}, reply: typeof statusReplyTemplate | null = statusReplyTemplate) =>
      ({ name, movesMachinery: false, safeToRepeat: true, replyTemplate: reply, sequence: null, ...over });
    const library = [
      c('Read speed'),
      c('Index 45°', { movesMachinery: true }),
      c('Read fault log', { safeToRepeat: false }),
      c('Ping', {}, null),
      c('Read both', { sequence: { mode: 'one-string', delayMs: 0, steps: [] } }),
      c('Status query'),
    ];
    expect(searchQueries(library).map((q) => q.name)).toEqual(['Read speed', 'Status query']);
    expect(searchQueries([])).toEqual([]);
  });
});
