/** Island for the public /workbench: the same composer with its own port settings, the live link (loaded when opened), tools, and saving for signed-in users. */
import { lazy, Suspense, useEffect, useState } from 'react';
import type { PortSettings } from '../../lib/frame/port-settings';
import { QueryProvider } from '../QueryProvider';
import { ComposerCore } from './Composer';
import { Later } from './Later';
import { PortQuick as PortQuickNow } from './PortQuick';
import { Section } from '../ui/Section';
import { Tools as ToolsNow } from './Tools';
import { WorkbenchLiveLink } from './WorkbenchLiveLink';
import type { CommandDraft } from './types';

interface Props {
  signedIn: boolean;
  canSave: boolean;
  signInHref: string;
  /** The command it opens with and the port settings it starts from (made by the page, so this island's first load carries no engine). */
  blank: CommandDraft;
  settings: PortSettings;
}

const SaveToDevice = /* @__PURE__ */ lazy(() => import('./SaveToDevice'));
// Rendered by the server at once; in the browser each loads after the island is interactive (see Later).
const PortQuick = import.meta.env.SSR ? PortQuickNow : /* @__PURE__ */ lazy(() => import('./PortQuick').then((m) => ({ default: m.PortQuick })));
const Tools = import.meta.env.SSR ? ToolsNow : /* @__PURE__ */ lazy(() => import('./Tools').then((m) => ({ default: m.Tools })));

export default function Workbench({ signedIn, canSave, signInHref, blank, settings }: Props) {
  // The device picker is a lazy chunk: rendered on the server it would suspend, and React would then throw
  // away the server's HTML for the whole boundary (a recoverable error, and an inline script the CSP refuses).
  const [mounted, setMounted] = useState(false);
  useEffect(() => setMounted(true), []);
  return (
    <QueryProvider>
      <div className="grid gap-4">
        <ComposerCore initial={blank} ports={[{ name: 'Workbench', settings }]} readOnly={false}
          portSlot={(s, set) => <Later loading="Loading the port settings…"><PortQuick settings={s} onChange={set} /></Later>}
          footer={(draft, valid, _replace, errors, now) => (
            <>
            <WorkbenchLiveLink settings={now.settings} command={{ ...draft, template: now.template, replyTemplate: now.replyTemplate }} />
            <Section title="Keep it" id="save">
              {!signedIn && <p><a href={signInHref} data-testid="sign-in-to-save">Sign in to save to a device</a>; everything else here works without an account.</p>}
              {signedIn && !canSave && <p className="text-sm text-muted">Your role in this team cannot add commands; ask an engineer to save it.</p>}
              {signedIn && canSave && (mounted
                ? <Suspense fallback={<p className="text-sm">Loading your devices…</p>}><SaveToDevice draft={draft} valid={valid} errors={errors} /></Suspense>
                : <p className="text-sm">Loading your devices…</p>)}
            </Section>
            </>
          )} />
        <Later loading="Loading the tools…"><Tools /></Later>
      </div>
    </QueryProvider>
  );
}
