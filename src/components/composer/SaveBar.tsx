/**
 * Saves a draft of a command or a sequence: a new one whole, an existing one as only the fields changed since it
 * was opened, with that version. A 409 shows the conflict notice (loaded only then): their change beside mine,
 * part by part, and a re-apply of only my changes on their version. What differs between a command and a
 * sequence (how a draft is compared, what a save sends, how a re-apply is merged) comes in `compare`.
 */
import { useMutation, useQueryClient } from '@tanstack/react-query';
import { Suspense, useState, type ReactNode } from 'react';
import { api, ApiError } from '../../lib/client/api';
import type { IsLeaf } from '../../lib/client/conflict';
import { commandKeys } from '../../lib/client/keys';
import { useConflict, type OpenConflict } from '../../lib/client/use-conflict';
import { SaveWithFindings, type ErrorFinding } from './SaveWithFindings';

/** How one kind of draft (`D`) is compared with the saved record (`R`) as a shape (`S`) and saved. */
export interface DraftCompare<D, R extends { id: string; version: number }, S> {
  /** The draft and the saved record alike, as the conflict notice compares them. */
  shapeOf(value: D | R): S;
  /** Which objects of the shape are compared whole. */
  isLeaf?: IsLeaf;
  /** The fields of `mine` that differ from `base`: all that an update sends. */
  changed(base: D, mine: D): Partial<D>;
  /** What a re-apply sends from the conflict notice: their version as its base, and my changes laid over it. */
  reapply(conflict: OpenConflict<D, R, S>): { base: D; mine: D };
  /** Sent with a new record before the draft's own fields. */
  createDefaults?: Record<string, unknown>;
}

/** What the conflict notice is given to act with. */
export interface NoticeActions { busy: boolean; onReapply(): void; onDiscard(): void }

interface Props<D, R extends { id: string; version: number }, S> {
  /** `command` or `sequence`: the button's and the notice's words. */
  noun: 'command' | 'sequence';
  compare: DraftCompare<D, R, S>;
  draft: D;
  /** The saved record as opened (or last saved): what the changes are counted from. */
  base: D;
  saved: { id: string; version: number } | null;
  owner: { kind: 'device' | 'profile'; id: string };
  /** Where the composer for a command lives, to go to after creating one. */
  composerHref: (id: string) => string;
  /** A save of mine went through: `c` as the API answered it, `sent` the draft it sent. */
  onSaved: (c: R, sent: D) => void;
  /** Show this version as saved (after a re-apply, or when keeping theirs). */
  onLoad: (c: R) => void;
  dirty: boolean;
  valid: boolean;
  /** Why it cannot be saved yet, when not valid. */
  invalidReason: string;
  /** Error findings of the preview: saving with any asks first (the history records it). */
  errors: readonly ErrorFinding[];
  /** The conflict notice, rendered lazily (its component loads only when a save meets a 409). */
  notice: (conflict: OpenConflict<D, R, S>, actions: NoticeActions) => ReactNode;
}

/** An update: the version it is based on, that version's draft, mine; `reapply` when sent from the conflict notice. */
interface Attempt<D> { version: number; base: D; mine: D; reapply?: boolean }

export function SaveBar<D extends object, R extends { id: string; version: number }, S>(props: Props<D, R, S>) {
  const { noun, compare, draft, base, saved, owner, composerHref, onSaved, onLoad, dirty, valid, invalidReason, errors, notice } = props;
  const [asking, setAsking] = useState(false);
  const qc = useQueryClient();
  const conflicts = useConflict<D, R, S>(compare.shapeOf, compare.isLeaf);
  const conflict = conflicts.conflict;
  const m = useMutation({
    mutationFn: (a: Attempt<D> | null) =>
      saved && a
        ? api<R>(`/api/commands/${saved.id}`, { method: 'PATCH', body: { version: a.version, ...compare.changed(a.base, a.mine) } })
        : api<R>('/api/commands', { body: { [owner.kind === 'device' ? 'deviceId' : 'profileId']: owner.id, ...compare.createDefaults, ...draft } }),
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
          onClick={() => (errors.length && !asking ? setAsking(true) : save())}>
          {saved ? 'Save changes' : noun === 'command' ? 'Save command' : 'Save sequence'}
        </button>
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
        <Suspense fallback={<p className="notice notice-warn text-sm" role="alert">Someone else saved this {noun} meanwhile; loading the comparison…</p>}>
          {notice(conflict, {
            busy: m.isPending,
            onReapply: () => m.mutate({ ...compare.reapply(conflict), version: conflict.version, reapply: true }),
            onDiscard: () => { onLoad(conflict.current); conflicts.clear(); },
          })}
        </Suspense>
      )}
    </div>
  );
}
