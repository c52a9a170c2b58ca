/** Paste what the device sent back for the whole sequence: each step's reply, its fields and its checksum verdict. */
import { useEffect, useMemo, useState } from 'react';
import type { decodeSequenceReply as Decode } from '../../lib/frame/sequence-reply';
import { formatChecksumValue, resolveChecksum } from '../../lib/frame/checksum';
import type { Template } from '../../lib/frame/template';
import { BytesInput, useBytesInput } from './BytesInput';
import { FindingsList } from './FindingsList';

export function SequenceReplies({ replies, names }: { replies: (Template | null)[]; names: string[] }) {
  const input = useBytesInput();
  const { read } = input;
  const [decode, setDecode] = useState<typeof Decode | null>(null);
  useEffect(() => {
    if (!read?.ok || decode) return;
    let live = true;
    import('../../lib/frame/sequence-reply').then((m) => live && setDecode(() => m.decodeSequenceReply));
    return () => { live = false; };
  }, [read, decode]);
  const decoded = useMemo(() => (read?.ok && decode ? decode(replies, read.bytes) : null), [read, decode, replies]);
  const widthOf = (step: number, id: string) => {
    const seg = replies[step]?.segments.find((x) => x.id === id);
    return (seg?.type === 'checksum' ? resolveChecksum(seg)?.width : undefined) ?? 8;
  };
  if (!replies.some(Boolean)) return <p className="text-sm text-muted">No step expects a reply: the steps' library commands have no reply template.</p>;
  return (
    <div className="grid gap-3">
      <BytesInput input={input} id="sequence-reply" label="Received, for the whole sequence" placeholder="e.g. 1=STA:+0004500,R*14$0D1=STA:+0004500,R*14$0D" />
      {decoded && (
        <div className="grid gap-3" data-testid="sequence-reply-result">
          {decoded.steps.map((r) => (
            <div key={r.step} className="border border-line rounded p-2 grid gap-2 min-w-0" data-testid="step-reply" data-ok={r.ok}>
              <p className="text-sm"><b>Step {r.step + 1}</b> · {names[r.step]} · bytes {r.start}–{Math.max(r.start, r.end - 1)}</p>
              {r.checksums.map((c) => (
                <p key={c.segmentId} className={`notice ${c.ok ? 'notice-ok' : 'notice-bad'} text-sm`} data-testid="step-checksum-verdict" data-ok={c.ok}>
                  <b>{c.ok ? 'Checksum good' : 'Checksum wrong'}</b> · {c.algorithm}: expected <span className="mono">{formatChecksumValue(c.expected, widthOf(r.step, c.segmentId))}</span>, received <span className="mono">{c.received === null ? 'unreadable' : formatChecksumValue(c.received, widthOf(r.step, c.segmentId))}</span>
                </p>
              ))}
              {Object.keys(r.fields).length > 0 && (
                <p className="text-sm mono break-all">{Object.entries(r.fields).map(([k, f]) => `${k} = ${String(f.value ?? f.text)}`).join(' · ')}</p>
              )}
              {r.findings.length > 0 && <FindingsList findings={r.findings} empty="" />}
            </div>
          ))}
          {decoded.findings.length > 0 && <FindingsList findings={decoded.findings} empty="" />}
          {decoded.ok && <p className="notice notice-ok text-sm">Every reply matches its step's reply template.</p>}
        </div>
      )}
    </div>
  );
}
