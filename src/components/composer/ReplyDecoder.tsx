/** Paste a received reply in any notation: decoded fields, the checksum verdict and findings. */
import { useEffect, useMemo, useState } from 'react';
import type { decodeReply as DecodeReply } from '../../lib/frame/decode-reply';
import { formatChecksumValue, resolveChecksum } from '../../lib/frame/checksum';
import type { Template } from '../../lib/frame/template';
import { BytesInput, useBytesInput } from './BytesInput';
import { FindingsList } from './FindingsList';

let loadedDecoder: typeof DecodeReply | null = null;

/** The reply decoder of the engine, loaded when the first reply is pasted (it is not needed before). */
function useDecodeReply(wanted: boolean): typeof DecodeReply | null {
  const [decode, setDecode] = useState(() => loadedDecoder);
  useEffect(() => {
    if (!wanted || decode) return;
    let live = true;
    import('../../lib/frame/decode-reply').then((m) => {
      loadedDecoder = m.decodeReply;
      if (live) setDecode(() => m.decodeReply);
    });
    return () => {
      live = false;
    };
  }, [wanted, decode]);
  return decode;
}

export function ReplyDecoder({ template }: { template: Template }) {
  const input = useBytesInput();
  const { read } = input;
  const decodeReply = useDecodeReply(!!read?.ok);
  const decoded = useMemo(() => (read?.ok && decodeReply ? decodeReply(template, read.bytes) : null), [read, template, decodeReply]);
  return (
    <div className="grid gap-3">
      <BytesInput input={input} id="reply" label="Received reply" placeholder="e.g. 1=STA:+0004500,R*14$0D" />
      {decoded && (
        <div className="grid gap-3" data-testid="reply-result">
          {decoded.checksums.map((c) => {
            const seg = template.segments.find((s) => s.id === c.segmentId);
            const width = (seg?.type === 'checksum' ? resolveChecksum(seg)?.width : undefined) ?? 8;
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
