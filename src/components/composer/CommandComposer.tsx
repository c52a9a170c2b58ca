/** Island for /vault/{devices,profiles}/[id]/commands/[commandId]: the composer plus saving, history and copy. */
import { useMutation } from '@tanstack/react-query';
import { lazy, Suspense, useState } from 'react';
import { api } from '../../lib/client/api';
import { QueryProvider } from '../QueryProvider';
import { ComposerCore } from './Composer';
import { commandCompare } from './command-conflict';
import { SaveBar } from './SaveBar';
import { Section } from '../ui/Section';
import { draftOf, type CommandDraft, type NamedPort } from './types';

export interface CommandComposerProps {
  command: CommandDraft & { id?: string; version?: number };
  ports: NamedPort[];
  owner: { kind: 'device' | 'profile'; id: string; label: string };
  /** `/vault/devices/X/commands` — the library this composer belongs to. */
  basePath: string;
  canEdit: boolean;
  /** A profile command seen from a device: read-only, with a copy action to this device. */
  inheritedFrom?: { profileId: string; label: string };
  /** Characters the machine's PLC STRING holds, when recorded. */
  plcStringCapacity?: number | null;
}

const History = /* @__PURE__ */ lazy(() => import('./History'));
const CommandConflict = /* @__PURE__ */ lazy(() => import('./CommandConflict'));

function CopyHere({ commandId, deviceId, basePath }: { commandId: string; deviceId: string; basePath: string }) {
  const m = useMutation({
    mutationFn: () => api<{ id: string }>(`/api/commands/${commandId}/copy`, { body: { deviceId } }),
    onSuccess: (c) => location.assign(`${basePath}/${c.id}`),
  });
  return (
    <>
      <button type="button" className="btn btn-sm" disabled={m.isPending} onClick={() => m.mutate()}>Copy to this device to change</button>
      {m.isError && <span className="text-bad text-sm" role="alert">{m.error.message}</span>}
    </>
  );
}

function Inner({ command, ports, owner, basePath, canEdit, inheritedFrom, plcStringCapacity }: CommandComposerProps) {
  const [saved, setSaved] = useState(command.id ? { id: command.id, version: command.version! } : null);
  const [base, setBase] = useState<CommandDraft>(draftOf(command));
  const [epoch, setEpoch] = useState(0);
  const [showHistory, setShowHistory] = useState(false);
  const readOnly = !canEdit || !!inheritedFrom;
  const banner = inheritedFrom && (
    <div className="notice notice-ok flex flex-wrap items-center gap-3" data-testid="inherited">
      <span className="text-sm">This command comes from the profile <b>{inheritedFrom.label}</b> and is shown read-only here.</span>
      {canEdit && saved && <CopyHere commandId={saved.id} deviceId={owner.id} basePath={basePath} />}
    </div>
  );
  const load = (c: CommandDraft & { id: string; version: number }) => {
    setSaved({ id: c.id, version: c.version });
    setBase(draftOf(c));
    setEpoch((e) => e + 1);
  };
  return (
    <ComposerCore key={epoch} initial={base} ports={ports} readOnly={readOnly} banner={banner} plcStringCapacity={plcStringCapacity ?? null}
      footer={(draft, valid, _replace, errors) => {
        const dirty = JSON.stringify(draftOf(draft)) !== JSON.stringify(base);
        return (
          <>
            {!readOnly && (
              <Section title="Save" id="save">
                <SaveBar noun="command" compare={commandCompare} draft={draftOf(draft)} base={base} saved={saved} owner={owner} valid={valid} errors={errors}
                  composerHref={(id) => `${basePath}/${id}`} dirty={dirty} invalidReason="Fix the template problems above before saving."
                  onSaved={(c) => { setSaved({ id: c.id, version: c.version }); setBase(draftOf(c)); }}
                  onLoad={load}
                  notice={(c, actions) => <CommandConflict version={c.version} rows={c.rows} base={c.base} mine={c.mine} theirs={draftOf(c.current)} {...actions} />} />
              </Section>
            )}
            {saved && (
              <Section title="History" id="history-panel">
                {showHistory ? (
                  <Suspense fallback={<p className="text-sm">Loading history…</p>}>
                    {/* Keeping their version shows it, unless there are edits: saving those then shows the conflict, part by part. */}
                    <History key={saved.version} commandId={saved.id} canRestore={canEdit && !inheritedFrom} seen={{ version: saved.version, draft: base }}
                      onRestored={load} onKeep={(c) => { if (!dirty) load(c); }} />
                  </Suspense>
                ) : (
                  <button type="button" className="btn btn-quiet btn-sm" onClick={() => setShowHistory(true)}>Show history (version {saved.version})</button>
                )}
              </Section>
            )}
          </>
        );
      }} />
  );
}

export default function CommandComposer(props: CommandComposerProps) {
  return (
    <QueryProvider>
      <Inner {...props} />
    </QueryProvider>
  );
}
