/** The composer's PLC code panel: closed at first; opening it loads the generator and its view (not counted in the page's JavaScript). */
import { lazy, Suspense, useState } from 'react';
import type { PlcCodeSource } from './PlcCodePanel';

const PlcCodePanel = /* @__PURE__ */ lazy(() => import('./PlcCodePanel'));

export function PlcCodeSection({ source, name }: { source: PlcCodeSource; name: string }) {
  const [open, setOpen] = useState(false);
  return (
    <details onToggle={(e) => setOpen(e.currentTarget.open)} data-testid="plc-code">
      <summary className="cursor-pointer text-sm">Structured Text that builds this {source.kind} from its fields at run time</summary>
      {open && (
        <Suspense fallback={<p className="text-sm text-muted mt-3">Loading the generator…</p>}>
          <PlcCodePanel source={source} name={name} />
        </Suspense>
      )}
    </details>
  );
}
