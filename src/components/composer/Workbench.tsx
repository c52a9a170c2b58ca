/** Island for the public /workbench: the same composer with its own port settings, the live link (loaded when opened), tools, and saving for signed-in users. */
import { lazy, Suspense, useEffect, useState } from 'react';
import { defaultPortSettings } from '../../lib/frame/port-settings';
import { starterTemplate } from '../../lib/composer/segments';
import { QueryProvider } from '../QueryProvider';
import { ComposerCore } from './Composer';
import { PortQuick } from './PortQuick';
import { Section } from '../ui/Section';
import { Tools } from './Tools';
import { WorkbenchLiveLink } from './WorkbenchLiveLink';
import type { CommandDraft } from './types';

interface Props { signedIn: boolean; canSave: boolean; signInHref: string }

const blank: CommandDraft = {
  name: 'One-off command', purpose: '', notes: '', movesMachinery: false, safeToRepeat: false, setsUpDevice: false, template: starterTemplate({ terminator: '0D' }),
  fieldValues: {}, replyTemplate: null, portName: '', rawUnits: {}, presets: [],
};

const SaveToDevice = /* @__PURE__ */ lazy(() => import('./SaveToDevice'));

export default function Workbench({ signedIn, canSave, signInHref }: Props) {
  // The device picker is a lazy chunk: rendered on the server it would suspend, and React would then throw
  // away the server's HTML for the whole boundary (a recoverable error, and an inline script the CSP refuses).
  const [mounted, setMounted] = useState(false);
  useEffect(() => setMounted(true), []);
  return (
    <QueryProvider>
      <div className="grid gap-4">
        <ComposerCore initial={blank} ports={[{ name: 'Workbench', settings: defaultPortSettings }]} readOnly={false}
          portSlot={(s, set) => <PortQuick settings={s} onChange={set} />}
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
        <Tools />
      </div>
    </QueryProvider>
  );
}
