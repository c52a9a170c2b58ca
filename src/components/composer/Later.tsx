/**
 * A part of an island that the server renders at once and the browser hydrates when its code arrives, after the
 * rest of the island is interactive (composer JavaScript budget, issue 16). Each such part is declared as
 *   const Part = import.meta.env.SSR ? PartNow : lazy(() => import('./Part'))
 * with the lazy call marked as pure (a module whose top level calls `lazy` unmarked has a side effect, and that
 * keeps its static import, and so its code, in the browser's first load). The server never suspends (a suspended
 * server render would stream an inline script the CSP refuses); the browser keeps the server's HTML in place
 * until the chunk is there. `data-later` reads "loading" until the part has hydrated, then "ready" (the browser
 * tests wait for it before they type).
 */
import { Suspense, useEffect, useRef, type ReactNode } from 'react';

function Ready() {
  const ref = useRef<HTMLSpanElement>(null);
  useEffect(() => {
    ref.current?.parentElement?.setAttribute('data-later', 'ready');
  }, []);
  return <span ref={ref} hidden />;
}

export function Later({ children, loading = 'Loading…' }: { children: ReactNode; loading?: string }) {
  return (
    <Suspense fallback={<p className="text-sm text-muted">{loading}</p>}>
      <div className="contents" data-later="loading">
        {children}
        <Ready />
      </div>
    </Suspense>
  );
}
