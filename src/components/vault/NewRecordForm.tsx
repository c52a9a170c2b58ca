/** "Add a site / machine / device / link / profile": a short form that creates the record and opens its page. */
import { useState } from 'react';
import { useForm } from 'react-hook-form';
import { zodResolver } from '@hookform/resolvers/zod';
import { useMutation } from '@tanstack/react-query';
import { z } from 'zod';
import { api, ApiError } from '../../lib/client/api';
import { QueryProvider } from '../QueryProvider';
import { FormField } from '../FormField';
import { DEVICE_ROLES, LINK_KINDS } from '../../lib/schemas/vault';
import { kindOptions, roleOptions } from './field-defs';
import { ErrorNotice, useUnsavedGuard } from './shared';

const text = (what: string, max = 120) => z.string().trim().min(1, `Enter ${what}.`).max(max, `Use at most ${max} characters.`);

const KINDS = {
  site: { api: 'sites', page: 'sites', title: 'Add a site', schema: z.strictObject({ name: text('a site name'), customer: z.string().trim().max(120) }),
    fields: [{ name: 'name', label: 'Site name' }, { name: 'customer', label: 'Customer' }] },
  machine: { api: 'machines', page: 'machines', title: 'Add a machine', schema: z.strictObject({ name: text('a machine name'), code: z.string().trim().max(60) }),
    fields: [{ name: 'name', label: 'Machine, line or cell' }, { name: 'code', label: 'Customer’s number' }] },
  device: { api: 'devices', page: 'devices', title: 'Add a device', schema: z.strictObject({ tag: text('a tag', 40), name: z.string().trim().max(120), role: z.enum(DEVICE_ROLES), profileId: z.string() }),
    fields: [{ name: 'tag', label: 'Tag' }, { name: 'name', label: 'Name' }, { name: 'role', label: 'Role', options: roleOptions }, { name: 'profileId', label: 'Start from profile' }] },
  link: { api: 'links', page: 'links', title: 'Add a link', schema: z.strictObject({ name: text('a link name'), kind: z.enum(LINK_KINDS) }),
    fields: [{ name: 'name', label: 'Link name' }, { name: 'kind', label: 'Kind', options: kindOptions }] },
  profile: { api: 'profiles', page: 'profiles', title: 'Add a profile', schema: z.strictObject({ name: text('a profile name'), role: z.enum(DEVICE_ROLES) }),
    fields: [{ name: 'name', label: 'Profile name' }, { name: 'role', label: 'Role', options: roleOptions }] },
} as const;

interface Props {
  kind: keyof typeof KINDS;
  /** Parent ids sent with the record, e.g. `{ siteId }` for a machine. */
  parent?: Record<string, string>;
  profiles?: { id: string; name: string }[];
}

function Form({ kind, parent = {}, profiles = [] }: Props) {
  const k = KINDS[kind];
  const [open, setOpen] = useState(false);
  const defaults: Record<string, string> = { name: '', customer: '', code: '', tag: '', role: 'other', kind: 'point-to-point', profileId: '' };
  const form = useForm<Record<string, string>>({ resolver: zodResolver(k.schema as never) as never, defaultValues: Object.fromEntries(k.fields.map((f) => [f.name, defaults[f.name] ?? ''])) });
  useUnsavedGuard(form.formState.isDirty);
  const create = useMutation({
    mutationFn: (v: Record<string, string>) => {
      const body: Record<string, unknown> = { ...parent, ...v };
      if (kind === 'device') {
        if (!v.profileId) delete body.profileId;
        else if (v.role === 'other') delete body.role; // the profile's role applies
      }
      return api<{ id: string }>(`/api/${k.api}`, { body });
    },
    onSuccess: (rec) => {
      form.reset(form.getValues());
      location.assign(`/vault/${k.page}/${rec.id}`);
    },
    onError: (err) => {
      if (err instanceof ApiError) for (const [f, message] of Object.entries(err.fields)) form.setError(f, { message });
    },
  });
  if (!open) return <button type="button" className="btn btn-sm" onClick={() => setOpen(true)}>{k.title}</button>;
  const e = form.formState.errors;
  return (
    <form onSubmit={form.handleSubmit((v) => create.mutate(v))} noValidate aria-label={k.title} className="card grid gap-x-3 sm:grid-cols-2 w-full">
      <h3 className="font-semibold sm:col-span-2 mb-2">{k.title}</h3>
      {k.fields.map((f, i) => {
        const id = `new-${kind}-${f.name}`;
        const options = f.name === 'profileId' ? [{ value: '', label: 'None — add ports by hand' }, ...profiles.map((p) => ({ value: p.id, label: p.name }))] : 'options' in f ? f.options : null;
        return (
          <FormField key={f.name} id={id} label={f.label} error={e[f.name]?.message}>
            {options ? (
              <select id={id} className="input" {...form.register(f.name)}>
                {options.map((o) => <option key={o.value} value={o.value}>{o.label}</option>)}
              </select>
            ) : (
              <input id={id} className="input" autoFocus={i === 0} aria-invalid={!!e[f.name]} {...form.register(f.name)} />
            )}
          </FormField>
        );
      })}
      <div className="sm:col-span-2 flex gap-2">
        <button className="btn" disabled={create.isPending}>Create</button>
        <button type="button" className="btn btn-quiet" onClick={() => { form.reset(); setOpen(false); }}>Cancel</button>
      </div>
      {create.isError && !(create.error instanceof ApiError && Object.keys(create.error.fields).length) && <div className="sm:col-span-2 mt-2"><ErrorNotice error={create.error} /></div>}
    </form>
  );
}

export default function NewRecordForm(props: Props) {
  return (
    <QueryProvider>
      <Form {...props} />
    </QueryProvider>
  );
}
