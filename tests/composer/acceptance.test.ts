/**
 * The acceptance example (common practice for indexing drives): 9600 8-N-1, 36,000 steps per
 * revolution, a 45° index move and 1° jogs as carriage-return-delimited ASCII, in our own demo syntax.
 */
import { describe, expect, it } from 'vitest';
import { decodeReply, latin1Bytes, portSettingsSchema, previewFrame } from '../../src/lib/frame';
import { indexMoveTemplate, jogTemplate, statusQueryTemplate, statusReplyTemplate } from '../../src/lib/composer/demo';
import { notationRows } from '../../src/lib/composer/notations';
import { timingSummary } from '../../src/lib/composer/timing';
import { bothUnits } from '../../src/lib/composer/scaling';

const port = portSettingsSchema.parse({ baud: 9600, dataBits: 8, parity: 'none', stopBits: 1, protocol: 'ascii', frameRules: { terminator: '0D', byteSet: 'printable', letterCase: 'upper' } });
const row = (bytes: Uint8Array, id: string) => notationRows(bytes).find((r) => r.id === id)!.text;

describe('acceptance example (common practice)', () => {
  it('45° at 36,000 steps/rev is 4,500 steps, in one CR-delimited string with ramps and speed', () => {
    const p = previewFrame(indexMoveTemplate, { angle: 45, accel: 5, decel: 5, speed: 0.5 }, port);
    expect(p.findings).toEqual([]);
    expect(row(p.bytes, 'iecLiteral')).toBe("'1!IDX:+4500/R180000/F180000/S18000$0D'");
    expect(p.byteCount).toBe(35);
    const t = timingSummary(port, p.byteCount, null);
    expect(t.rows.find((r) => r.id === 'frame')!.value).toBe('36.458 ms');
    expect(bothUnits(indexMoveTemplate.segments[2] as never, 45, 'steps')).toBe('45 ° = 4500 steps');
  });

  it('1° jogs are 100 steps either way, 11 bytes, 11.458 ms each', () => {
    for (const [dir, text] of [['+', "'1!JOG:+100$0D'"], ['-', "'1!JOG:-100$0D'"]] as const) {
      const p = previewFrame(jogTemplate(dir), {}, port);
      expect(row(p.bytes, 'iecLiteral')).toBe(text);
      expect(p.byteCount).toBe(11);
      expect(timingSummary(port, 11, null).rows.find((r) => r.id === 'frame')!.value).toBe('11.458 ms');
    }
  });

  it('the status query carries an XOR-8 check in hex, and a reply with a bad check is caught', () => {
    const q = previewFrame(statusQueryTemplate, {}, port);
    expect(row(q.bytes, 'iecLiteral')).toBe("'1?STA*48$0D'");
    const good = decodeReply(statusReplyTemplate, latin1Bytes('1=STA:+0004500,R*14\r') as Uint8Array);
    expect(good.ok).toBe(true);
    expect(good.fields.position!.value).toBe(45);
    expect(good.fields.state!.value).toBe('ready');
    const bad = decodeReply(statusReplyTemplate, latin1Bytes('1=STA:+0004500,R*15\r') as Uint8Array);
    expect(bad.checksums[0]).toMatchObject({ ok: false, expected: 0x14, received: 0x15 });
    expect(bad.findings.map((f) => f.code)).toEqual(['checksum-mismatch']);
  });
});
