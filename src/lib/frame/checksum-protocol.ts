/** Checks a template's checksums against what the port's protocol requires (Modbus RTU and Modbus ASCII). */
import type { SegmentSpan } from './assemble';
import { resolveChecksum } from './checksum';
import type { Finding } from './findings';
import type { PROTOCOLS } from './port-settings';
import type { Template } from './template';

/**
 * Modbus RTU: CRC-16/MODBUS goes low byte first (Modbus over Serial Line V1.02, 2.5.1.2).
 * Modbus ASCII: the LRC covers the bytes the hex characters stand for, not the characters (2.5.2.2).
 * Other protocols: no findings. `spans` (from `assembleFrame`) give the byte ranges.
 */
export function checkChecksumProtocol(template: Template, spans: readonly SegmentSpan[], protocol: (typeof PROTOCOLS)[number] | undefined): Finding[] {
  if (protocol !== 'modbus-rtu' && protocol !== 'modbus-ascii') return [];
  const findings: Finding[] = [];
  template.segments.forEach((s, i) => {
    if (s.type !== 'checksum') return;
    const a = resolveChecksum(s);
    const span = spans[i];
    const range: [number, number] | undefined = span ? [span.start, span.end] : undefined;
    const add = (code: Finding['code'], message: string) => findings.push(range ? { severity: 'error', code, message, range, segmentId: s.id } : { severity: 'error', code, message, segmentId: s.id });
    if (protocol === 'modbus-rtu' && a?.name === 'CRC-16/MODBUS' && s.encoding === 'binary' && s.byteOrder === 'high-first') {
      add('checksum-byte-order', 'Modbus RTU sends the CRC-16/MODBUS low byte first; this template sends it high byte first, so every device will reject the frame. Set the byte order to low byte first.');
    }
    if (protocol === 'modbus-ascii' && a?.kind === 'lrc' && s.over !== 'decoded-hex') {
      add('checksum-over-characters', 'Modbus ASCII computes the LRC over the bytes the hex characters stand for (":0103…" counts 01 03 …), not over the characters themselves. Set the checksum to be computed over the decoded hex.');
    }
  });
  return findings;
}
