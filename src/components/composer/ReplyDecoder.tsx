/** Paste a received reply in any notation: decoded fields, the checksum verdict and findings. */
import { useMemo, useState } from 'react';
import { decodeReply } from '../../lib/frame/decode-reply';
import { formatChecksumValue, findChecksumAlgorithm } from '../../lib/frame/checksum';
import type { Template } from '../../lib/frame/template';
import { NOTATION_LABELS, readReply, REPLY_NOTATIONS, type ReplyNotation } from '../../lib/composer/reply';
import { FindingsList } from './FindingsList';

export function ReplyDecoder({ template }: { template: Template }) {
  const [text, setText] = useState('');
  const [notation, setNotation] = useState<ReplyNotation>('auto');
  const read = useMemo(() => (text ? readReply(text, notation) : null), [text, notation]);
  const decoded = useMemo(() => (read?.ok ? decodeReply(template, read.bytes) : null), [read, template]);
  return (
    <div className="grid gap-3">
      <div className="grid gap-2 sm:grid-cols-[1fr_14rem]">
        <div>
          <label htmlFor="reply-text" className="label">Received reply</label>
          <textarea id="reply-text" className="input mono" rows={2} value={text} onChange={(e) => setText(e.target.value)} placeholder="e.g. 1=STA:+0004500,R*14$0D" />
        </div>
        <div>
          <label htmlFor="reply-notation" className="label">Written as</label>
          <select id="reply-notation" className="input" value={notation} onChange={(e) => setNotation(e.target.value as ReplyNotation)}>
            {REPLY_NOTATIONS.map((n) => <option key={n} value={n}>{n === 'auto' ? 'Recognise automatically' : NOTATION_LABELS[n]}</option>)}
          </select>
          {read && <p className="text-xs text-muted mt-1">Read as {NOTATION_LABELS[read.notation]}.</p>}
        </div>
      </div>
      {read && !read.ok && <p className="notice notice-bad text-sm" role="alert">Character {read.error.position}: {read.error.message}</p>}
      {decoded && (
        <div className="grid gap-3" data-testid="reply-result">
          {decoded.checksums.map((c) => {
            const width = findChecksumAlgorithm(c.algorithm)?.width ?? 8;
            return (
              <p key={c.segmentId} className={`notice ${c.ok ? 'notice-ok' : 'notice-bad'}`} data-testid="checksum-verdict" data-ok={c.ok}>
                <b>{c.ok ? 'Checksum good' : 'Checksum wrong'}</b> · {c.algorithm}: expected <span className="mono">{formatChecksumValue(c.expected, width)}</span>, received{' '}
                <span className="mono">{c.received === null ? 'unreadable' : formatChecksumValue(c.received, width)}</span>
              </p>
            );
          })}
          {Object.keys(decoded.fields).length > 0 && (
            <table className="table" data-testid="reply-fields">
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
      )}
    </div>
  );
}
