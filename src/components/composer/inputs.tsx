/** Small controlled inputs for the segment editor: numbers and hex keep the text as typed until it is valid. */
import { useEffect, useState } from 'react';
import { parseHex } from '../../lib/frame/notations/numeric';

export function Labeled({ id, label, children, wide }: { id: string; label: string; children: React.ReactNode; wide?: boolean }) {
  return (
    <div className={wide ? 'col-span-2' : ''}>
      <label htmlFor={id} className="label !text-xs">{label}</label>
      {children}
    </div>
  );
}

export function NumInput({ id, value, onChange, allowEmpty = true, integer, min, readOnly }: {
  id: string; value: number | undefined; onChange: (v: number | undefined) => void; allowEmpty?: boolean; integer?: boolean; min?: number; readOnly?: boolean;
}) {
  const [text, setText] = useState(value === undefined ? '' : String(value));
  useEffect(() => {
    if (Number(text) !== value && !(text === '' && value === undefined)) setText(value === undefined ? '' : String(value));
    // eslint-disable-next-line react-hooks/exhaustive-deps
  }, [value]);
  const n = Number(text);
  const bad = text.trim() === '' ? !allowEmpty : !Number.isFinite(n) || (integer && !Number.isInteger(n)) || (min !== undefined && n < min);
  return (
    <input id={id} className="input !py-1" inputMode="decimal" value={text} aria-invalid={bad} readOnly={readOnly}
      onChange={(e) => {
        const t = e.target.value;
        setText(t);
        const v = Number(t);
        if (t.trim() === '') { if (allowEmpty) onChange(undefined); }
        else if (Number.isFinite(v) && (!integer || Number.isInteger(v)) && (min === undefined || v >= min)) onChange(v);
      }} />
  );
}

export function HexInput({ id, value, onChange, readOnly }: { id: string; value: string; onChange: (hex: string) => void; readOnly?: boolean }) {
  const [text, setText] = useState(value);
  const [error, setError] = useState<string | null>(null);
  useEffect(() => { if (!error) setText(value); }, [value, error]);
  return (
    <>
      <input id={id} className="input !py-1 mono" value={text} aria-invalid={!!error} readOnly={readOnly} aria-describedby={error ? `${id}-err` : undefined}
        onChange={(e) => {
          const t = e.target.value;
          setText(t);
          const r = parseHex(t);
          if (r.ok && r.value.length > 0) { setError(null); onChange(t); }
          else setError(r.ok ? 'Enter at least one byte.' : r.error.message);
        }} />
      {error && <p id={`${id}-err`} className="field-error">{error}</p>}
    </>
  );
}
