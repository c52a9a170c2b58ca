/** Saves the draft (create or versioned update); a 409 offers to load the saved version or save over it. */
import { useMutation, useQueryClient } from '@tanstack/react-query';
import { useState } from 'react';
import { api, ApiError } from '../../lib/client/api';
import { commandKeys } from '../../lib/client/keys';
import type { CommandDraft } from './types';

interface Saved extends CommandDraft { id: string; version: number }

interface Props {
  draft: CommandDraft;
  saved: { id: string; version: number } | null;
  owner: { kind: 'device' | 'profile'; id: string };
  /** Where the composer for a command lives, to go to after creating one. */
  composerHref: (id: string) => string;
  onSaved: (c: Saved) => void;
  onLoad: (c: Saved) => void;
  dirty: boolean;
  valid: boolean;
}

export function SaveBar({ draft, saved, owner, composerHref, onSaved, onLoad, dirty, valid }: Props) {
  const qc = useQueryClient();
  const [conflict, setConflict] = useState<Saved | null>(null);
  const m = useMutation({
    mutationFn: (version?: number) =>
      saved
        ? api<Saved>(`/api/commands/${saved.id}`, { method: 'PATCH', body: { version: version ?? saved.version, ...draft } })
        : api<Saved>('/api/commands', { body: { [owner.kind === 'device' ? 'deviceId' : 'profileId']: owner.id, ...draft } }),
    onSuccess: (c) => {
      setConflict(null);
      qc.invalidateQueries({ queryKey: commandKeys.all() });
      if (!saved) location.assign(composerHref(c.id));
      else onSaved(c);
    },
    onError: (err) => {
      if (err instanceof ApiError && err.status === 409 && err.body.current) setConflict(err.body.current as Saved);
    },
  });
  const error = m.error instanceof ApiError && m.error.status !== 409 ? m.error : null;
  return (
    <div className="grid gap-2" data-testid="save-bar">
      <div className="flex flex-wrap items-center gap-3">
        <button type="button" className="btn" disabled={!valid || m.isPending || (!!saved && !dirty)} onClick={() => m.mutate(undefined)}>
          {saved ? 'Save changes' : 'Save command'}
        </button>
        <span className="text-sm text-muted" role="status">
          {m.isPending ? 'Saving…' : saved ? (dirty ? 'Unsaved changes' : `Saved · version ${saved.version}`) : 'Not saved yet'}
        </span>
      </div>
      {!valid && <p className="text-sm text-bad">Fix the template problems above before saving.</p>}
      {error && (
        <div className="notice notice-bad text-sm" role="alert">
          <p>{error.message}</p>
          {Object.entries(error.fields).map(([k, v]) => <p key={k} className="mono text-xs">{k}: {v}</p>)}
        </div>
      )}
      {conflict && (
        <div className="notice notice-warn text-sm grid gap-2" role="alert" data-testid="conflict">
          <p>Someone saved this command while you were editing (now version {conflict.version}). Nothing of yours was saved.</p>
          <div className="flex flex-wrap gap-2">
            <button type="button" className="btn btn-sm" onClick={() => m.mutate(conflict.version)}>Save mine over version {conflict.version}</button>
            <button type="button" className="btn btn-quiet btn-sm" onClick={() => { onLoad(conflict); setConflict(null); }}>Drop mine, load the saved version</button>
          </div>
        </div>
      )}
    </div>
  );
}
