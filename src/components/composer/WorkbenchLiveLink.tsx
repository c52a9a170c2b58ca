/**
 * The live link on the workbench: a button, and the panel (Web Serial, simulator, engine parts of its own)
 * imported only when it is pressed, so the workbench's first load carries none of it.
 */
import { lazy, Suspense, useState } from 'react';
import { Section } from '../ui/Section';
import type { WorkbenchLiveProps } from '../live/WorkbenchLivePanel';

const WorkbenchLivePanel = lazy(() => import('../live/WorkbenchLivePanel'));

export function WorkbenchLiveLink(props: WorkbenchLiveProps) {
  const [open, setOpen] = useState(false);
  return (
    <Section title="Live link" id="live-link">
      {open ? (
        <Suspense fallback={<p role="status">Loading the live link…</p>}>
          <WorkbenchLivePanel {...props} />
        </Suspense>
      ) : (
        <>
          <p className="text-sm text-muted mb-3">
            Send this command through a USB serial adapter at the settings above, or try it against a simulated device that answers it with its reply template.
          </p>
          <button type="button" className="btn" onClick={() => setOpen(true)}>Open the live link</button>
        </>
      )}
    </Section>
  );
}
