/**
 * The live link on a device page: a heading and one button. The panel (engine, simulator, Web Serial) is
 * imported only when the button is pressed, so the page loads none of it.
 */
import { lazy, Suspense, useState } from 'react';
import type { LiveLinkProps } from './types';

const LiveLinkPanel = lazy(() => import('./LiveLinkPanel'));

export default function LiveLinkOpener(props: LiveLinkProps) {
  const [open, setOpen] = useState(false);
  return (
    <section className="card min-w-0" aria-labelledby="live-link-title" data-testid="live-link">
      <h2 id="live-link-title" className="mb-2">Live link</h2>
      {open ? (
        <Suspense fallback={<p role="status">Loading the live link…</p>}>
          <LiveLinkPanel {...props} />
        </Suspense>
      ) : (
        <>
          <p className="text-sm text-muted mb-3">
            Talk to this device from the browser through a USB serial adapter, with the port settings stored here, or try it
            against a simulated device built from this device's commands.
          </p>
          <button type="button" className="btn" onClick={() => setOpen(true)}>Open the live link</button>
        </>
      )}
    </section>
  );
}
