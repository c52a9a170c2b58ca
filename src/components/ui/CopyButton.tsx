import { useEffect, useState } from 'react';

/**
 * Copies `text` with navigator.clipboard and says so for two seconds, or says why it could not.
 * `label` is the button's text; `what` names the content for screen readers: "Copy PLC literal" with the
 * plain "Copy", else the label followed by it ("Copy as text, X3 settings"), so the name starts with what is seen.
 */
export function CopyButton({ text, label = 'Copy', what }: { text: string; label?: string; what?: string }) {
  const [state, setState] = useState<'idle' | 'copied' | 'failed'>('idle');
  useEffect(() => {
    if (state === 'idle') return;
    const t = setTimeout(() => setState('idle'), 2000);
    return () => clearTimeout(t);
  }, [state]);
  const copy = async () => {
    try {
      await navigator.clipboard.writeText(text);
      setState('copied');
    } catch {
      setState('failed');
    }
  };
  return (
    <span className="inline-flex flex-row-reverse items-center gap-2 shrink-0">
      <button type="button" className="btn btn-quiet btn-sm" onClick={copy} aria-label={what ? (label === 'Copy' ? `Copy ${what}` : `${label}, ${what}`) : undefined}>{label}</button>
      <span role="status" aria-live="polite" className={state === 'failed' ? 'text-bad text-sm' : 'text-ok text-sm'}>
        {state === 'copied' ? 'Copied' : state === 'failed' ? 'Copy blocked; select the text instead' : ''}
      </span>
    </span>
  );
}
