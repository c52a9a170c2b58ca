/**
 * Saves the draft: a new command whole, an existing one as only the fields changed since it was opened, with that
 * version. A 409 shows the conflict notice: their change beside mine, segment by segment, and a re-apply of only
 * my changes on their version.
 */
import { useMutation, useQueryClient } from '@tanstack/react-query';
import { lazy, Suspense, useState } from 'react';
import { api, ApiError } from '../../lib/client/api';
import { commandKeys } from '../../lib/client/keys';
import { useConflict } from '../../lib/client/use-conflict';
import { changedDraftFields, commandShape, mergedDraft, segmentIsLeaf } from './command-conflict';
import { draftOf, type CommandDraft } from './types';
import { SaveWithFindings, type ErrorFinding } from './SaveWithFindings';

const CommandConflict = /* @__PURE__ */ lazy(() => import('./CommandConflict'));

interface Saved extends CommandDraft { id: string; version: number }

interface Props {
  draft: CommandDraft;
  /** The saved command as opened (or last saved): what the changes are counted from. */
  base: CommandDraft;
  saved: { id: string; version: number } | null;
  owner: { kind: 'device' | 'profile'; id: string };
  /** Where the composer for a command lives, to go to after creating one. */
  composerHref: (id: string) => string;
  onSaved: (c: Saved) => void;
  onLoad: (c: Saved) => void;
  dirty: boolean;
  valid: boolean;
  /** Error findings of the preview: saving with any asks first (the history records it). */
  errors?: readonly ErrorFinding[];
}

/** An update: the version it is based on, that version's draft, mine; `reapply` when sent from the conflict notice. */
interface Attempt { version: number; base: CommandDraft; mine: CommandDraft; reapply?: boolean }

export function SaveBar({ draft, base, saved, owner, composerHref, onSaved, onLoad, dirty, valid, errors = [] }: Props) {
  const [asking, setAsking] = useState(false);
  const qc = useQueryClient();
  const conflicts = useConflict<CommandDraft, Saved, ReturnType<typeof commandShape>>(commandShape, segmentIsLeaf);
  const conflict = conflicts.conflict;
  const m = useMutation({
    mutationFn: (a: Attempt | null) =>
      saved && a
        ? api<Saved>(`/api/commands/${saved.id}`, { method: 'PATCH', body: { version: a.version, ...changedDraftFields(a.base, a.mine) } })
        : api<Saved>('/api/commands', { body: { [owner.kind === 'device' ? 'deviceId' : 'profileId']: owner.id, ...draft } }),
    onSuccess: (c, a) => {
      conflicts.clear();
      setAsking(false);
      qc.invalidateQueries({ queryKey: commandKeys.all() });
      if (!saved) location.assign(composerHref(c.id));
      else if (a?.reapply) onLoad(c);
      else onSaved(c);
    },
    onError: (err, a) => {
      if (a) conflicts.take(err, a.base, a.mine);
    },
  });
  const error = m.error instanceof ApiError && !conflict ? m.error : null;
  const save = () => m.mutate(saved ? { version: saved.version, base, mine: draftOf(draft) } : null);
  const theirs = conflict && draftOf(conflict.current);
  return (
    <div className="grid gap-2" data-testid="save-bar">
      <div className="flex flex-wrap items-center gap-3">
        <button type="button" className="btn" disabled={!valid || m.isPending || (!!saved && !dirty)}
          onClick={() => (errors.length && !asking ? setAsking(true) : save())}>
          {saved ? 'Save changes' : 'Save command'}
        </button>
        <span className="text-sm text-muted" role="status">
          {m.isPending ? 'Saving…' : saved ? (dirty ? 'Unsaved changes' : `Saved · version ${saved.version}`) : 'Not saved yet'}
        </span>
      </div>
      {!valid && <p className="text-sm text-bad">Fix the template problems above before saving.</p>}
      {asking && errors.length > 0 && <SaveWithFindings errors={errors} busy={m.isPending} onSave={save} onCancel={() => setAsking(false)} />}
      {error && (
        <div className="notice notice-bad text-sm" role="alert">
          <p>{error.message}</p>
          {Object.entries(error.fields).map(([k, v]) => <p key={k} className="mono text-xs">{k}: {v}</p>)}
        </div>
      )}
      {conflict && theirs && (
        <Suspense fallback={<p className="notice notice-warn text-sm" role="alert">Someone else saved this command meanwhile; loading the comparison…</p>}>
          <CommandConflict version={conflict.version} rows={conflict.rows} base={conflict.base} mine={conflict.mine} theirs={theirs} busy={m.isPending}
            onReapply={() => m.mutate({ version: conflict.version, base: theirs, mine: mergedDraft(conflict.merged, conflict.base, conflict.mine, theirs), reapply: true })}
            onDiscard={() => { onLoad(conflict.current); conflicts.clear(); }} />
        </Suspense>
      )}
    </div>
  );
}
