/** A reply read against its template: each checksum's verdict, the fields, the findings (the composer's reply decoder and the live link alike). */
import type { ChecksumVerdict, DecodedField } from '../../lib/frame/decode-reply';
import { formatChecksumValue, resolveChecksum } from '../../lib/frame/checksum';
import type { Finding } from '../../lib/frame/findings';
import type { Template } from '../../lib/frame/template';
import { FindingsList } from './FindingsList';

export interface DecodedReplyProps {
  decoded: { checksums: ChecksumVerdict[]; fields: Record<string, DecodedField>; findings: Finding[] };
  template: Template;
  /** Test ids of the whole, each checksum verdict and the fields table. */
  testIds: { root: string; checksum: string; fields: string };
}

export function DecodedReply({ decoded, template, testIds }: DecodedReplyProps) {
  return (
    <div className="grid gap-2" data-testid={testIds.root}>
      {decoded.checksums.map((c) => {
        const seg = template.segments.find((s) => s.id === c.segmentId);
        const width = (seg?.type === 'checksum' ? resolveChecksum(seg)?.width : undefined) ?? 8;
        return (
          <p key={c.segmentId} className={`notice ${c.ok ? 'notice-ok' : 'notice-bad'}`} data-testid={testIds.checksum} data-ok={c.ok}>
            <b>{c.ok ? 'Checksum good' : 'Checksum wrong'}</b> · {c.algorithm}: expected <span className="mono">{formatChecksumValue(c.expected, width)}</span>, received{' '}
            <span className="mono">{c.received === null ? 'unreadable' : formatChecksumValue(c.received, width)}</span>
          </p>
        );
      })}
      {Object.keys(decoded.fields).length > 0 && (
        <table className="table" data-testid={testIds.fields}>
          <thead><tr><th>Field</th><th>Received</th><th>Value</th></tr></thead>
          <tbody>
            {Object.entries(decoded.fields).map(([name, f]) => (
              <tr key={name}><td className="mono">{name}</td><td className="mono">{f.text}</td><td className="mono">{String(f.value ?? '–')}</td></tr>
            ))}
          </tbody>
        </table>
      )}
      <FindingsList findings={decoded.findings} empty="The reply matches the reply template." />
    </div>
  );
}
