/** Text in any notation, with the notation it is written in and the reading error: shared by the reply decoder and the workbench tools. */
import { useMemo, useState } from 'react';
import { NOTATION_LABELS, readReply, REPLY_NOTATIONS, type ReplyNotation } from '../../lib/composer/reply';

export function useBytesInput() {
  const [text, setText] = useState('');
  const [notation, setNotation] = useState<ReplyNotation>('auto');
  const read = useMemo(() => (text ? readReply(text, notation) : null), [text, notation]);
  return { text, setText, notation, setNotation, read };
}

type Input = ReturnType<typeof useBytesInput>;

export function BytesInput({ input, id, label, placeholder, showLength = false }: { input: Input; id: string; label: string; placeholder: string; showLength?: boolean }) {
  const { text, setText, notation, setNotation, read } = input;
  return (
    <>
      <div className="grid gap-2 sm:grid-cols-[1fr_14rem]">
        <div>
          <label htmlFor={`${id}-text`} className="label">{label}</label>
          <textarea id={`${id}-text`} className="input mono" rows={2} value={text} onChange={(e) => setText(e.target.value)} placeholder={placeholder} />
        </div>
        <div>
          <label htmlFor={`${id}-notation`} className="label">Written as</label>
          <select id={`${id}-notation`} className="input" value={notation} onChange={(e) => setNotation(e.target.value as ReplyNotation)}>
            {REPLY_NOTATIONS.map((n) => <option key={n} value={n}>{n === 'auto' ? 'Recognise automatically' : NOTATION_LABELS[n]}</option>)}
          </select>
          {read && (
            <p className="text-xs text-muted mt-1">
              Read as {NOTATION_LABELS[read.notation]}
              {showLength && ` · ${read.ok ? `${read.bytes.length} bytes` : 'not readable'}`}
              {!showLength && '.'}
            </p>
          )}
        </div>
      </div>
      {read && !read.ok && <p className="notice notice-bad text-sm mt-2" role="alert">Character {read.error.position}: {read.error.message}</p>}
    </>
  );
}
