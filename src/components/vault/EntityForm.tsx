/**
 * A versioned edit form for one vault record: sends only the fields you changed with the version
 * you opened, shows field errors inline, and on 409 shows the conflict notice (their change beside yours,
 * re-apply only yours on their version).
 */
import { useEffect, useState } from 'react';
import { useForm } from 'react-hook-form';
import { zodResolver } from '@hookform/resolvers/zod';
import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { z } from 'zod';
import { api, ApiError } from '../../lib/client/api';
import { vaultKeys } from '../../lib/client/keys';
import { changedFields, changedPaths } from '../../lib/client/conflict';
import { useConflict } from '../../lib/client/use-conflict';
import { FormField } from '../FormField';
import { ConflictNotice } from '../ui/ConflictNotice';
import { ErrorNotice, fieldLabel, useUnsavedGuard } from './shared';

export interface FieldDef {
  name: string;
  label: string;
  kind?: 'text' | 'textarea' | 'select' | 'number';
  options?: readonly { value: string; label: string }[];
  hint?: string;
}

type Rec = Record<string, unknown> & { id: string; version: number };

interface Props {
  path: string;
  record: Rec;
  fields: FieldDef[];
  schema: z.ZodType;
  canEdit: boolean;
  /** Where to go after moving the record to the trash; no delete button when absent. */
  afterDelete?: string;
  noun: string;
  onSaved?(record: Rec): void;
}

const pick = (r: Record<string, unknown>, names: string[]) => Object.fromEntries(names.map((n) => [n, r[n] ?? (n === 'cableLengthM' || n === 'plcStringCapacity' ? null : '')]));

export function EntityForm({ path, record, fields, schema, canEdit, afterDelete, noun, onSaved }: Props) {
  const qc = useQueryClient();
  const names = fields.map((f) => f.name);
  const [base, setBase] = useState<Rec>(record);
  const conflicts = useConflict<Record<string, unknown>, Rec>((current) => pick(current, names));
  const conflict = conflicts.conflict;
  const form = useForm<Record<string, unknown>>({ resolver: zodResolver(schema as never) as never, defaultValues: pick(record, names) });
  const { errors, dirtyFields, isDirty } = form.formState;
  useUnsavedGuard(isDirty);
  // A newer version saved elsewhere on the page (e.g. a link's members): take it while nothing is being edited.
  useEffect(() => {
    if (!isDirty && record.version > base.version) {
      setBase(record);
      form.reset(pick(record, names));
    }
  }, [record.version]); // eslint-disable-line react-hooks/exhaustive-deps

  /** One attempt: the version it is based on, that version's fields and mine; only the fields that differ are sent. */
  type Attempt = { version: number; base: Record<string, unknown>; mine: Record<string, unknown> };
  const save = useMutation({
    mutationFn: ({ version, base: from, mine }: Attempt) => api<Rec>(path, { method: 'PATCH', body: { version, ...changedFields(mine, changedPaths(from, mine)) } }),
    onSuccess: (saved) => {
      setBase(saved);
      conflicts.clear();
      form.reset(pick(saved, names));
      qc.invalidateQueries({ queryKey: vaultKeys.all() });
      onSaved?.(saved);
    },
    onError: (err, attempt) => {
      if (conflicts.take(err, attempt.base, attempt.mine)) return;
      if (err instanceof ApiError) {
        for (const [k, message] of Object.entries(err.fields)) if (names.includes(k)) form.setError(k, { message });
      }
    },
  });
  // Moving to the trash names the version seen; if someone saved since, their change is shown before it goes.
  const trashConflicts = useConflict<Record<string, unknown>, Rec>((current) => pick(current, names));
  const trashConflict = trashConflicts.conflict;
  const remove = useMutation({
    mutationFn: (version: number) => api(`${path}?version=${version}`, { method: 'DELETE' }),
    onSuccess: () => {
      form.reset(form.getValues());
      location.assign(afterDelete!);
    },
    onError: (err) => trashConflicts.take(err, pick(base, names), pick(base, names)),
  });

  const submit = form.handleSubmit((values) => {
    const opened = pick(base, names);
    const changed = Object.fromEntries(Object.keys(dirtyFields).map((k) => [k, values[k]]));
    save.mutate({ version: base.version, base: opened, mine: { ...opened, ...changed } });
  });
  const labels: Record<string, string> = Object.fromEntries(fields.map((f) => [f.name, f.label]));

  return (
    <form onSubmit={submit} noValidate aria-label={`Edit ${noun}`}>
      <fieldset disabled={!canEdit} className="grid gap-x-4 sm:grid-cols-2">
        {fields.map((f) => {
          const id = `${noun}-${f.name}`;
          const err = errors[f.name]?.message as string | undefined;
          const common = { id, className: 'input disabled:bg-paper disabled:border-line', 'aria-invalid': !!err, 'aria-describedby': err ? `${id}-error` : undefined };
          return (
            <div key={f.name} className={f.kind === 'textarea' ? 'sm:col-span-2' : ''}>
              <FormField id={id} label={f.label} error={err} hint={f.hint}>
                {f.kind === 'textarea' ? (
                  <textarea rows={3} {...common} {...form.register(f.name)} />
                ) : f.kind === 'select' ? (
                  <select {...common} {...form.register(f.name)}>
                    {f.options!.map((o) => <option key={o.value} value={o.value}>{o.label}</option>)}
                  </select>
                ) : f.kind === 'number' ? (
                  <input type="number" step="any" inputMode="decimal" {...common} {...form.register(f.name, { setValueAs: (v) => (v === '' || v === null ? null : Number(v)) })} />
                ) : (
                  <input {...common} {...form.register(f.name)} />
                )}
              </FormField>
            </div>
          );
        })}
      </fieldset>
      {conflict && (
        <div className="mb-3">
          <ConflictNotice
            noun={noun}
            version={conflict.version}
            rows={conflict.rows}
            label={(p) => labels[p[0]!] ?? fieldLabel(p.join('.'))}
            busy={save.isPending}
            onReapply={() => save.mutate({ version: conflict.version, base: conflict.theirs, mine: conflict.merged })}
            onDiscard={() => {
              setBase(conflict.current);
              form.reset(pick(conflict.current, names));
              conflicts.clear();
            }}
          />
        </div>
      )}
      {save.isError && !conflict && <ErrorNotice error={save.error} />}
      {trashConflict && (
        <div className="mb-3">
          <ConflictNotice noun={noun} version={trashConflict.version} rows={trashConflict.rows} label={(p) => labels[p[0]!] ?? fieldLabel(p.join('.'))}
            busy={remove.isPending} explain={`Nothing was moved to the trash. Their change is below; move the ${noun} as it is now, or keep it.`}
            reapplyLabel={`Move version ${trashConflict.version} to the trash`} discardLabel="Keep it"
            onReapply={() => remove.mutate(trashConflict.version)}
            onDiscard={() => {
              // With edits open, the base stays: saving them then shows this conflict again, part by part.
              if (!isDirty) {
                setBase(trashConflict.current);
                form.reset(pick(trashConflict.current, names));
              }
              trashConflicts.clear();
            }} />
        </div>
      )}
      {remove.isError && !trashConflict && <ErrorNotice error={remove.error} />}
      {canEdit && (
        <div className="flex flex-wrap items-center gap-2 mt-1">
          <button className="btn" disabled={save.isPending || !isDirty}>Save {noun}</button>
          {isDirty && <button type="button" className="btn btn-quiet" onClick={() => form.reset()}>Undo changes</button>}
          {save.isSuccess && !isDirty && <span className="text-sm text-ok" role="status">Saved · version {base.version}</span>}
          {afterDelete && (
            <button type="button" className="btn btn-quiet ml-auto" disabled={remove.isPending}
              onClick={() => confirm(`Move this ${noun} to the trash? An engineer can restore it from there.`) && remove.mutate(base.version)}>
              Move to trash
            </button>
          )}
        </div>
      )}
      <p className="text-xs text-muted mt-2">Version {base.version}</p>
    </form>
  );
}
