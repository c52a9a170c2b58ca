/** Small pieces shared by the vault islands: state badge, unsaved-changes guard, pager, error notice. */
import { useEffect } from 'react';

const STATE_TEXT = { ok: 'Agrees', warning: 'Check', error: 'Mismatch' } as const;
const STATE_CLASS = {
  ok: 'bg-ok/10 text-ok border-ok',
  warning: 'bg-warn/10 text-warn border-warn',
  error: 'bg-bad/10 text-bad border-bad',
} as const;

/** Red / amber / green state of a link, with a word so colour is never the only cue. */
export function StateBadge({ state }: { state: 'ok' | 'warning' | 'error' }) {
  return (
    <span data-testid="link-state" data-state={state} className={`inline-flex items-center gap-1 rounded border px-1.5 py-0.5 text-xs font-semibold ${STATE_CLASS[state]}`}>
      <span aria-hidden="true" className={`inline-block h-2 w-2 rounded-full ${state === 'ok' ? 'bg-ok' : state === 'warning' ? 'bg-warn' : 'bg-bad'}`} />
      {STATE_TEXT[state]}
    </span>
  );
}

/** Warns before leaving with unsaved changes: the browser's own prompt on unload, a confirm on in-app links. */
export function useUnsavedGuard(dirty: boolean) {
  useEffect(() => {
    if (!dirty) return;
    const onUnload = (e: BeforeUnloadEvent) => {
      e.preventDefault();
      e.returnValue = '';
    };
    const onClick = (e: MouseEvent) => {
      const a = (e.target as Element | null)?.closest?.('a[href]') as HTMLAnchorElement | null;
      if (!a || a.target === '_blank' || e.defaultPrevented) return;
      if (!confirm('You have unsaved changes. Leave this page and lose them?')) e.preventDefault();
    };
    window.addEventListener('beforeunload', onUnload);
    document.addEventListener('click', onClick, true);
    return () => {
      window.removeEventListener('beforeunload', onUnload);
      document.removeEventListener('click', onClick, true);
    };
  }, [dirty]);
}

export function ErrorNotice({ error }: { error: unknown }) {
  if (!error) return null;
  const message = error instanceof Error ? error.message : String(error);
  return <p className="notice notice-bad" role="alert">{message}</p>;
}

export function Pager({ page, pageSize, total, onPage }: { page: number; pageSize: number; total: number; onPage: (p: number) => void }) {
  const pages = Math.max(1, Math.ceil(total / pageSize));
  return (
    <nav aria-label="Pages" className="flex flex-wrap items-center gap-2 text-sm mt-3">
      <button type="button" className="btn btn-quiet btn-sm" disabled={page <= 1} onClick={() => onPage(page - 1)}>Previous</button>
      <span>Page {page} of {pages} · {total} in all</span>
      <button type="button" className="btn btn-quiet btn-sm" disabled={page >= pages} onClick={() => onPage(page + 1)}>Next</button>
    </nav>
  );
}

/**
 * Previous and next for a list read by cursor, whose total is counted up to a cap: past it the total reads "more
 * than", and the number of pages is not known.
 */
export function CursorPager({ page, pageSize, total, capped, onPrevious, onNext }: {
  page: number; pageSize: number; total: number; capped: boolean; onPrevious: () => void; onNext?: () => void;
}) {
  const all = capped ? `more than ${total.toLocaleString('en')} in all` : `${total.toLocaleString('en')} in all`;
  const pages = capped ? '' : ` of ${Math.max(1, Math.ceil(total / pageSize))}`;
  return (
    <nav aria-label="Pages" className="flex flex-wrap items-center gap-2 text-sm mt-3">
      <button type="button" className="btn btn-quiet btn-sm" disabled={page <= 1} onClick={onPrevious}>Previous</button>
      <span>Page {page}{pages} · {all}</span>
      <button type="button" className="btn btn-quiet btn-sm" disabled={!onNext} onClick={onNext}>Next</button>
    </nav>
  );
}

export { showValue } from '../../lib/client/conflict';

export function fieldLabel(field: string): string {
  const last = field.split('.').slice(-1)[0]!;
  return field.startsWith('settings.') ? `${last} (settings)` : field;
}

