/**
 * Island for a saved sequence (/vault/{devices,profiles}/[id]/commands/[commandId] when the command is one, or
 * `new?kind=sequence`): its steps from the library or inline, one string or separate sends, the preview of the
 * whole string with each step's span, the replies per step, and saving. Its own island, so the single-command
 * composer carries none of it.
 */
import { useQuery } from '@tanstack/react-query';
import { lazy, useState } from 'react';
import { api } from '../../lib/client/api';
import { same } from '../../lib/client/conflict';
import { commandKeys } from '../../lib/client/keys';
import type { SavedSequence } from '../../lib/composer/saved-sequence';
import { QueryProvider } from '../QueryProvider';
import { Caution } from '../ui/Caution';
import { Section } from '../ui/Section';
import { CommandDetails } from './CommandDetails';
import { sequenceDraftOf, type SavedSequenceCommand, type SequenceDraft } from './sequence-conflict';
import SequenceBodyNow, { type SequenceDetails } from './SequenceBody';
import type { KeyedStep } from './SequenceSteps';
import { Later } from './Later';
import type { LibraryCommand } from './sequence-types';
import type { CommandDraft, NamedPort } from './types';

export interface SequenceComposerProps {
  command: CommandDraft & { id?: string; version?: number; sequence: SavedSequence | null };
  ports: NamedPort[];
  owner: { kind: 'device' | 'profile'; id: string; label: string };
  basePath: string;
  canEdit: boolean;
  inheritedFrom?: { profileId: string; label: string };
  plcStringCapacity?: number | null;
}

// Everything that needs the frame engine or zod: rendered by the server at once, loaded by the browser after this
// shell is interactive (see Later). Keep this module's imports free of the engine and of any module that builds a schema.
// The steps and replies load after the body (see SequenceBody); their download starts with the body's.
const SequenceBody = import.meta.env.SSR ? SequenceBodyNow : /* @__PURE__ */ lazy(() => {
  void import('./SequenceSteps');
  void import('./SequenceReplies');
  return import('./SequenceBody');
});
// Keys of the saved steps are their positions, alike on the server and in the browser (ids must match on hydration).
const keyed = (seq: SavedSequence | null): KeyedStep[] => (seq?.steps ?? []).map((step, i) => ({ key: `saved${i}`, step, epoch: 0 }));

function useLibrary(owner: SequenceComposerProps['owner']) {
  const param = owner.kind === 'device' ? 'deviceId' : 'profileId';
  const live = useQuery({ queryKey: commandKeys.list(owner), queryFn: () => api<{ items: LibraryCommand[] }>(`/api/commands?${param}=${owner.id}`) });
  const trashed = useQuery({ queryKey: commandKeys.list(owner, true), queryFn: () => api<{ items: LibraryCommand[] }>(`/api/commands?${param}=${owner.id}&trashed=true`) });
  return { live: live.data?.items ?? null, trashed: trashed.data?.items ?? [], error: live.error };
}

/** Holds the saved sequence the editor counts its changes from; loading another version (theirs, or a re-apply) opens the editor anew on it. */
function Inner(props: SequenceComposerProps) {
  const { command } = props;
  const [saved, setSaved] = useState(command.id ? { id: command.id, version: command.version! } : null);
  const [base, setBase] = useState<SequenceDraft>(() => sequenceDraftOf(command));
  const [epoch, setEpoch] = useState(0);
  const load = (c: SavedSequenceCommand) => {
    setSaved({ id: c.id, version: c.version });
    setBase(sequenceDraftOf(c));
    setEpoch((e) => e + 1);
  };
  return (
    <Editor key={epoch} {...props} saved={saved} base={base} onLoad={load}
      onSaved={(c, sent) => { setSaved({ id: c.id, version: c.version }); setBase(sent); }} />
  );
}

interface EditorProps extends SequenceComposerProps {
  saved: { id: string; version: number } | null;
  base: SequenceDraft;
  onSaved: (c: { id: string; version: number }, sent: SequenceDraft) => void;
  onLoad: (c: SavedSequenceCommand) => void;
}

function Editor({ command, ports, owner, basePath, canEdit, inheritedFrom, plcStringCapacity = null, saved, base, onSaved, onLoad }: EditorProps) {
  const { sequence: opened, ...openedDetails } = base;
  const [details, setDetails] = useState<SequenceDetails>(openedDetails);
  const [steps, setSteps] = useState<KeyedStep[]>(() => keyed(opened));
  const [mode, setMode] = useState(opened.mode);
  const [delayMs, setDelayMs] = useState(opened.delayMs);
  const readOnly = !canEdit || !!inheritedFrom;

  const lib = useLibrary(owner);
  const sequence: SavedSequence = { mode, delayMs: mode === 'separate' ? delayMs : 0, steps: steps.map((s) => s.step) };
  const moves = details.movesMachinery || sequence.steps.some((x) => x.commandId && (lib.live ?? []).find((c) => c.id === x.commandId)?.movesMachinery);
  const draft: SequenceDraft = sequenceDraftOf({ ...details, sequence });
  const dirty = !same(draft, base);

  return (
    <div className="grid gap-4" data-testid="sequence-composer">
      {inheritedFrom && <p className="notice notice-ok text-sm" data-testid="inherited">This sequence comes from the profile <b>{inheritedFrom.label}</b> and is shown read-only here.</p>}
      {moves && <Caution lead="This sequence moves machinery." testId="machinery-caution" />}
      <Section title="Sequence" id="details">
        <CommandDetails draft={{ ...command, ...details }} onChange={(p) => setDetails((d) => ({ ...d, ...p }))} readOnly={readOnly} sequence />
      </Section>
      <Later loading="Loading the sequence composer…">
        <SequenceBody command={command} ports={ports} owner={owner} basePath={basePath} readOnly={readOnly} plcStringCapacity={plcStringCapacity}
          saved={saved} base={base} onSaved={onSaved} onLoad={onLoad} details={details} setDetails={setDetails} steps={steps} setSteps={setSteps}
          mode={mode} setMode={setMode} delayMs={delayMs} setDelayMs={setDelayMs} lib={lib} draft={draft} dirty={dirty} />
      </Later>
    </div>
  );
}

export default function SequenceComposer(props: SequenceComposerProps) {
  return (
    <QueryProvider>
      <Inner {...props} />
    </QueryProvider>
  );
}
