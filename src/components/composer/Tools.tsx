/** Workbench tools: convert text between notations, and every checksum of some bytes. */
import { useMemo, useState } from 'react';
import { computeChecksum, formatChecksumValue, listChecksumAlgorithms } from '../../lib/frame/checksum';
import { NOTATION_LABELS, readReply, REPLY_NOTATIONS, type ReplyNotation } from '../../lib/composer/reply';
import { notationRows } from '../../lib/composer/notations';
import { NotationList } from './NotationList';
import { Section } from './Section';

const ALGORITHMS = listChecksumAlgorithms();

export function Tools() {
  const [text, setText] = useState('');
  const [notation, setNotation] = useState<ReplyNotation>('auto');
  const read = useMemo(() => (text ? readReply(text, notation) : null), [text, notation]);
  const bytes = read?.ok ? read.bytes : null;
  return (
    <Section title="Convert and check" id="tools">
      <div className="grid gap-2 sm:grid-cols-[1fr_14rem]">
        <div>
          <label htmlFor="conv-text" className="label">Bytes, in any notation</label>
          <textarea id="conv-text" className="input mono" rows={2} value={text} onChange={(e) => setText(e.target.value)} placeholder="e.g. 02 41 42 03 or 'AB$0D'" />
        </div>
        <div>
          <label htmlFor="conv-notation" className="label">Written as</label>
          <select id="conv-notation" className="input" value={notation} onChange={(e) => setNotation(e.target.value as ReplyNotation)}>
            {REPLY_NOTATIONS.map((n) => <option key={n} value={n}>{n === 'auto' ? 'Recognise automatically' : NOTATION_LABELS[n]}</option>)}
          </select>
          {read && <p className="text-xs text-muted mt-1">Read as {NOTATION_LABELS[read.notation]} · {read.ok ? `${read.bytes.length} bytes` : 'not readable'}</p>}
        </div>
      </div>
      {read && !read.ok && <p className="notice notice-bad text-sm mt-2" role="alert">Character {read.error.position}: {read.error.message}</p>}
      {bytes && (
        <div className="grid gap-4 lg:grid-cols-2 mt-3">
          <NotationList rows={notationRows(bytes)} />
          <table className="table" data-testid="checksums">
            <thead><tr><th>Checksum</th><th>Value</th></tr></thead>
            <tbody>
              {ALGORITHMS.map((a) => {
                const r = computeChecksum(a.name, bytes);
                return <tr key={a.name}><td>{a.name}</td><td className="mono">{r.ok ? formatChecksumValue(r.value.value, r.value.width) : '–'}</td></tr>;
              })}
            </tbody>
          </table>
        </div>
      )}
    </Section>
  );
}
