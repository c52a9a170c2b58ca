/**
 * The command composer island: segment editor, field values, live preview, timing, wire picture and
 * reply decoder over the frame engine. Used on device and profile pages and on the public workbench.
 *
 * This is its shell, what the browser loads before the island is interactive: the draft's state, the command's
 * details and the machinery caution. Everything that needs the frame engine or zod is ComposerBody, which the
 * server renders at once and the browser loads after the shell is interactive (see Later; composer JavaScript
 * budget, issue 16). Keep this module's imports free of the engine and of any module that builds a schema.
 */
import { lazy, useState, type ReactNode } from 'react';
import type { PortSettings } from '../../lib/frame/port-settings';
import type { Template } from '../../lib/frame/template';
import { Caution } from '../ui/Caution';
import { CommandDetails } from './CommandDetails';
import { Section } from '../ui/Section';
import ComposerBodyNow from './ComposerBody';
import { Later } from './Later';
import type { CommandDraft, NamedPort } from './types';

// The parts the body always shows load after it (see ComposerBody); their download starts with the body's, so
// they hydrate one round trip sooner on a slow link.
const ComposerBody = import.meta.env.SSR ? ComposerBodyNow : /* @__PURE__ */ lazy(() => {
  void import('./SegmentEditor');
  void import('./ValuesForm');
  void import('./WirePicture');
  return import('./ComposerBody');
});

export interface ComposerCoreProps {
  initial: CommandDraft;
  ports: NamedPort[];
  readOnly: boolean;
  /** Replaces the port picker (the workbench edits its own settings). */
  portSlot?: (settings: PortSettings, set: (s: PortSettings) => void) => ReactNode;
  /** Rendered under the details: save bar, copy action, history; `now` is what the preview shows (templates as last valid, the port settings in use). */
  footer?: (draft: CommandDraft, valid: boolean, replace: (d: CommandDraft) => void, errors: readonly { code: string; message: string }[], now: ComposedNow) => ReactNode;
  /** Shown above everything (e.g. the inherited-command notice). */
  banner?: ReactNode;
  showDetails?: boolean;
  /** Characters the machine's PLC STRING holds (a device command on a machine that records it); null = not recorded. */
  plcStringCapacity?: number | null;
}

/** The command as the preview shows it: its last valid templates and the port settings in use. */
export interface ComposedNow {
  template: Template;
  replyTemplate: Template | null;
  settings: PortSettings;
}

export function ComposerCore({ initial, ports, readOnly, portSlot, footer, banner, showDetails = true, plcStringCapacity = null }: ComposerCoreProps) {
  const [draft, setDraft] = useState<CommandDraft>(initial);
  const [formKey, setFormKey] = useState(0);
  const [ownSettings, setOwnSettings] = useState<PortSettings | null>(ports[0]?.settings ?? null);
  const patch = (p: Partial<CommandDraft>) => setDraft((d) => ({ ...d, ...p }));
  const replace = (d: CommandDraft) => { setDraft(d); setFormKey((k) => k + 1); };

  return (
    <div className="grid gap-4">
      {banner}
      {draft.movesMachinery && <Caution lead="This command moves machinery." testId="machinery-caution" />}
      {showDetails && (
        <Section title="Command" id="details">
          <CommandDetails draft={draft} onChange={patch} readOnly={readOnly} />
        </Section>
      )}
      <Later loading="Loading the composer…">
        <ComposerBody draft={draft} patch={patch} replace={replace} formKey={formKey} ports={ports} readOnly={readOnly} portSlot={portSlot} footer={footer}
          ownSettings={ownSettings} setOwnSettings={setOwnSettings} plcStringCapacity={plcStringCapacity} />
      </Later>
    </div>
  );
}
