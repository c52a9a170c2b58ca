import { useForm } from 'react-hook-form';
import { zodResolver } from '@hookform/resolvers/zod';
import { useMutation } from '@tanstack/react-query';
import { useState } from 'react';
import { QueryProvider } from './QueryProvider';
import { FormField } from './FormField';
import { api } from '../lib/client/api';
import { renameTeamSchema } from '../lib/schemas/platform';
import { can, type Role } from '../lib/permissions';

function Settings({ teamName, role }: { teamName: string; role: Role }) {
  const form = useForm({ resolver: zodResolver(renameTeamSchema), defaultValues: { name: teamName } });
  const rename = useMutation({ mutationFn: (v: { name: string }) => api('/api/teams/current', { method: 'PATCH', body: v }), onSuccess: () => location.reload() });
  const [confirmName, setConfirmName] = useState('');
  const del = useMutation({ mutationFn: () => api('/api/teams/current', { method: 'DELETE', body: { confirmName } }), onSuccess: () => location.assign('/') });
  return (
    <section className="card grid gap-4">
      <h2>Team settings</h2>
      <form onSubmit={form.handleSubmit((v) => rename.mutate(v))} noValidate className="flex flex-wrap items-end gap-2">
        <div className="flex-1 min-w-48">
          <FormField id="rename" label="Team name" error={form.formState.errors.name?.message ?? rename.error?.message}>
            <input id="rename" className="input" {...form.register('name')} />
          </FormField>
        </div>
        <div className="mb-3"><button className="btn btn-quiet">Rename</button></div>
      </form>
      {can(role, 'team:delete') && (
        <div className="border-t border-line pt-3">
          <h3 className="font-semibold text-bad">Delete this team</h3>
          <p className="text-sm mb-2">Removes the team and everything in its vault for every member. Type the team name to confirm.</p>
          {del.isError && <p className="notice notice-bad mb-2" role="alert">{del.error.message}</p>}
          <div className="flex flex-wrap gap-2">
            <input aria-label="Team name to confirm deletion" className="input !w-64" value={confirmName} onChange={(e) => setConfirmName(e.target.value)} />
            <button className="btn btn-danger" disabled={confirmName !== teamName || del.isPending} onClick={() => del.mutate()}>Delete team</button>
          </div>
        </div>
      )}
    </section>
  );
}

export default function TeamSettings(props: { teamName: string; role: Role }) {
  return (
    <QueryProvider>
      <Settings {...props} />
    </QueryProvider>
  );
}
