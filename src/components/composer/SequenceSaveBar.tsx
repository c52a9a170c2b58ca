/**
 * Saves a sequence: a new one whole, an existing one as only the fields changed since it was opened, with that
 * version. A 409 shows the conflict notice: their change beside mine, part by part (the steps as one part), and
 * a re-apply of only my changes on their version.
 */
import { useMutation, useQueryClient } from '@tanstack/react-query';
import { lazy, Suspense, useState } from 'react';
import { api, ApiError } from '../../lib/client/api';
import { commandKeys } from '../../lib/client/keys';
import { useConflict } from '../../lib/client/use-conflict';
import type { Template } from '../../lib/frame/template';
import { changedSequenceFields, sequenceDraftOf, type SequenceDraft } from './sequence-conflict';
import { SaveWithFindings, type ErrorFinding } from './SaveWithFindings';

const SequenceConflict = /* @__PURE__ */ lazy(() => import('./SequenceConflict'));

const EMPTY: Template = { version: 1, segments: [] };

export type SavedSequenceCommand = Omit<SequenceDraft, 'sequence'> & { id: string; version: number; sequence: SequenceDraft['sequence'] | null };

interface Props {
  draft: SequenceDraft;
  /** The saved sequence as opened (or last saved): what the changes are counted from. */
  base: SequenceDraft;
  saved: { id: string; version: number } | null;
  owner: { kind: 'device' | 'profile'; id: string };
  /** Where the composer for a command lives, to go to after creating one. */
  composerHref: (id: string) => string;
  /** A save of mine went through: `sent` is the draft it sent. */
  onSaved: (c: { id: string; version: number }, sent: SequenceDraft) => void;
  /** Show this version as saved (after a re-apply, or when keeping theirs). */
  onLoad: (c: SavedSequenceCommand) => void;
  dirty: boolean;
  valid: boolean;
  /** Why it cannot be saved yet, when not valid. */
  invalidReason: string;
  errors: readonly ErrorFinding[];
  nameOf: (id: string) => string | undefined;
}

/** An update: the version it is based on, that version's draft, mine; `reapply` when sent from the conflict notice. */
interface Attempt { version: number; base: SequenceDraft; mine: SequenceDraft; reapply?: boolean }

export function SequenceSaveBar({ draft, base, saved, owner, composerHref, onSaved, onLoad, dirty, valid, invalidReason, errors, nameOf }: Props) {
  const [asking, setAsking] = useState(false);
  const qc = useQueryClient();
  const conflicts = useConflict<SequenceDraft, SavedSequenceCommand>(sequenceDraftOf);
  const conflict = conflicts.conflict;
  const m = useMutation({
    mutationFn: (a: Attempt | null) =>
      saved && a
        ? api<SavedSequenceCommand>(`/api/commands/${saved.id}`, { method: 'PATCH', body: { version: a.version, ...changedSequenceFields(a.base, a.mine) } })
        : api<SavedSequenceCommand>('/api/commands', { body: { [owner.kind === 'device' ? 'deviceId' : 'profileId']: owner.id, template: EMPTY, ...draft } }),
    onSuccess: (c, a) => {
      conflicts.clear();
      setAsking(false);
      qc.invalidateQueries({ queryKey: commandKeys.all() });
      if (!saved) location.assign(composerHref(c.id));
      else if (a?.reapply) onLoad(c);
      else onSaved(c, a?.mine ?? draft);
    },
    onError: (err, a) => {
      if (a) conflicts.take(err, a.base, a.mine);
    },
  });
  const error = m.error instanceof ApiError && !conflict ? m.error : null;
  const save = () => m.mutate(saved ? { version: saved.version, base, mine: draft } : null);
  return (
    <div className="grid gap-2" data-testid="save-bar">
      <div className="flex flex-wrap items-center gap-3">
        <button type="button" className="btn" disabled={!valid || m.isPending || (!!saved && !dirty)}
          onClick={() => (errors.length && !asking ? setAsking(true) : save())}>{saved ? 'Save changes' : 'Save sequence'}</button>
        <span className="text-sm text-muted" role="status">
          {m.isPending ? 'Saving…' : saved ? (dirty ? 'Unsaved changes' : `Saved · version ${saved.version}`) : 'Not saved yet'}
        </span>
      </div>
      {!valid && <p className="text-sm text-bad">{invalidReason}</p>}
      {asking && errors.length > 0 && <SaveWithFindings errors={errors} busy={m.isPending} onSave={save} onCancel={() => setAsking(false)} />}
      {error && (
        <div className="notice notice-bad text-sm" role="alert">
          <p>{error.message}</p>
          {Object.entries(error.fields).map(([k, v]) => <p key={k} className="mono text-xs">{k}: {v}</p>)}
        </div>
      )}
      {conflict && (
        <Suspense fallback={<p className="notice notice-warn text-sm" role="alert">Someone else saved this sequence meanwhile; loading the comparison…</p>}>
          <SequenceConflict version={conflict.version} rows={conflict.rows} nameOf={nameOf} busy={m.isPending}
            onReapply={() => m.mutate({ version: conflict.version, base: conflict.theirs, mine: conflict.merged, reapply: true })}
            onDiscard={() => { onLoad(conflict.current); conflicts.clear(); }} />
        </Suspense>
      )}
    </div>
  );
}
