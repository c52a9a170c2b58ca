import { useForm } from 'react-hook-form';
import { zodResolver } from '@hookform/resolvers/zod';
import { useMutation, useQuery, useQueryClient } from '@tanstack/react-query';
import { useState } from 'react';
import { QueryProvider } from './QueryProvider';
import { FormField } from './FormField';
import { api } from '../lib/client/api';
import { teamKeys } from '../lib/client/keys';
import { inviteSchema } from '../lib/schemas/platform';
import { assignableRoles, can, ROLE_LABELS, ROLE_SUMMARIES, type Role } from '../lib/permissions';

interface Member { userId: string; name: string; email: string; role: Role }
interface Invitation { id: string; email: string; role: Role; expiresAt: string }

interface Props { teamId: string; teamName: string; role: Role; userId: string }

function InviteForm({ teamId, role }: { teamId: string; role: Role }) {
  const qc = useQueryClient();
  const roles = assignableRoles(role);
  const form = useForm({ resolver: zodResolver(inviteSchema), defaultValues: { email: '', role: 'engineer' as Role } });
  const m = useMutation({
    mutationFn: (v: { email: string; role: Role }) => api<Invitation>('/api/invitations', { body: v }),
    onSuccess: () => {
      form.reset({ email: '', role: form.getValues('role') });
      qc.invalidateQueries({ queryKey: teamKeys.members(teamId) });
    },
  });
  const e = form.formState.errors;
  return (
    <form onSubmit={form.handleSubmit((v) => m.mutate(v))} noValidate className="grid gap-2 sm:grid-cols-[1fr_12rem_auto] sm:items-end">
      <FormField id="invite-email" label="E-mail" error={e.email?.message}>
        <input id="invite-email" type="email" className="input" aria-invalid={!!e.email} {...form.register('email')} />
      </FormField>
      <FormField id="invite-role" label="Role" error={e.role?.message}>
        <select id="invite-role" className="input" {...form.register('role')}>
          {roles.map((r) => <option key={r} value={r}>{ROLE_LABELS[r]}</option>)}
        </select>
      </FormField>
      <div className="mb-3"><button className="btn" disabled={m.isPending}>Send invitation</button></div>
      {m.isError && <p className="notice notice-bad sm:col-span-3" role="alert">{m.error.message}</p>}
      {m.isSuccess && <p className="notice notice-ok sm:col-span-3" role="status">Invitation sent to {m.data.email}.</p>}
    </form>
  );
}

function Panel({ teamId, teamName, role, userId }: Props) {
  const qc = useQueryClient();
  const [error, setError] = useState<string | null>(null);
  const q = useQuery({ queryKey: teamKeys.members(teamId), queryFn: () => api<{ members: Member[]; invitations: Invitation[] }>('/api/members') });
  const refresh = () => qc.invalidateQueries({ queryKey: teamKeys.members(teamId) });
  const onError = (err: Error) => setError(err.message);
  // A role change is asked first, in the row, and says when it is saved.
  const [asking, setAsking] = useState<{ member: Member; role: Role } | null>(null);
  const [saved, setSaved] = useState<{ userId: string; text: string } | null>(null);
  const changeRole = useMutation({
    mutationFn: (v: { member: Member; role: Role }) => api(`/api/members/${v.member.userId}`, { method: 'PATCH', body: { role: v.role } }),
    onSuccess: (_r, v) => { setAsking(null); setError(null); setSaved({ userId: v.member.userId, text: `Saved: ${v.member.name}’s role is now ${ROLE_LABELS[v.role]}.` }); return refresh(); },
    onError,
  });
  const remove = useMutation({ mutationFn: (id: string) => api(`/api/members/${id}`, { method: 'DELETE' }), onSuccess: refresh, onError });
  const revoke = useMutation({ mutationFn: (id: string) => api(`/api/invitations/${id}`, { method: 'DELETE' }), onSuccess: refresh, onError });
  const transfer = useMutation({ mutationFn: (id: string) => api('/api/teams/transfer', { body: { userId: id } }), onSuccess: () => location.reload(), onError });
  const manage = can(role, 'member:update');

  if (q.isPending) return <p>Loading members…</p>;
  if (q.isError) return <p className="notice notice-bad" role="alert">{q.error.message}</p>;
  const { members, invitations } = q.data;
  return (
    <div className="grid gap-6">
      {error && <p className="notice notice-bad" role="alert">{error}</p>}
      <section className="card overflow-x-auto">
        <h2 className="mb-2">Members of {teamName}</h2>
        <table className="table table-cards" data-testid="members">
          <thead><tr><th>Name</th><th>E-mail</th><th>Role</th>{manage && <th><span className="sr-only">Actions</span></th>}</tr></thead>
          <tbody>
            {members.map((m) => (
              <tr key={m.userId} data-email={m.email}>
                <td>{m.name}{m.userId === userId && <span className="text-muted"> (you)</span>}</td>
                <td className="break-all" data-label="E-mail">{m.email}</td>
                <td>
                  {manage && m.role !== 'owner' && m.userId !== userId ? (
                    <>
                      <select aria-label={`Role of ${m.name}`} className="input !w-auto !py-1" value={asking?.member.userId === m.userId ? asking.role : m.role}
                        disabled={changeRole.isPending}
                        onChange={(e) => { setSaved(null); const next = e.target.value as Role; setAsking(next === m.role ? null : { member: m, role: next }); }}>
                        {assignableRoles(role).map((r) => <option key={r} value={r}>{ROLE_LABELS[r]}</option>)}
                      </select>
                      {asking?.member.userId === m.userId && (
                        <div className="mt-2 grid gap-2 text-sm" data-testid="role-confirm">
                          <p>Change {m.name} from {ROLE_LABELS[m.role]} to {ROLE_LABELS[asking.role]}? {ROLE_SUMMARIES[asking.role]}</p>
                          <div className="flex flex-wrap gap-2">
                            <button type="button" className="btn btn-sm" disabled={changeRole.isPending} onClick={() => changeRole.mutate(asking)}>Change role</button>
                            <button type="button" className="btn btn-quiet btn-sm" disabled={changeRole.isPending} onClick={() => setAsking(null)}>Keep {ROLE_LABELS[m.role]}</button>
                          </div>
                        </div>
                      )}
                      {saved?.userId === m.userId && <p className="text-sm text-ok mt-1" role="status">{saved.text}</p>}
                    </>
                  ) : (
                    <span data-testid="role">{ROLE_LABELS[m.role]}</span>
                  )}
                </td>
                {manage && (
                  <td className="whitespace-nowrap text-right">
                    {m.role !== 'owner' && m.userId !== userId && (
                      <button className="btn btn-quiet btn-sm" onClick={() => confirm(`Remove ${m.name} from ${teamName}?`) && remove.mutate(m.userId)}>Remove</button>
                    )}
                    {role === 'owner' && m.userId !== userId && (
                      <button className="btn btn-quiet btn-sm ml-2" onClick={() => confirm(`Make ${m.name} the owner? You will become an admin.`) && transfer.mutate(m.userId)}>Make owner</button>
                    )}
                  </td>
                )}
              </tr>
            ))}
          </tbody>
        </table>
      </section>
      {can(role, 'member:invite') && (
        <section className="card">
          <h2 className="mb-2">Invite a colleague</h2>
          <InviteForm teamId={teamId} role={role} />
          <h3 className="font-semibold mt-4 mb-1">Open invitations</h3>
          {invitations.length === 0 ? <p className="text-muted text-sm">None.</p> : (
            <ul className="divide-y divide-line" data-testid="invitations">
              {invitations.map((i) => (
                <li key={i.id} className="py-2 flex flex-wrap items-center gap-2">
                  <span className="break-all">{i.email}</span>
                  <span className="text-sm text-muted">as {ROLE_LABELS[i.role]}, expires {new Date(i.expiresAt).toISOString().slice(0, 10)}</span>
                  <button className="btn btn-quiet btn-sm ml-auto" onClick={() => revoke.mutate(i.id)}>Withdraw</button>
                </li>
              ))}
            </ul>
          )}
        </section>
      )}
      <section className="card">
        <h2 className="mb-2">What each role may do</h2>
        <dl className="grid gap-1 sm:grid-cols-[8rem_1fr] text-sm">
          {(Object.keys(ROLE_SUMMARIES) as Role[]).map((r) => (
            <div key={r} className="contents"><dt className="font-semibold">{ROLE_LABELS[r]}</dt><dd>{ROLE_SUMMARIES[r]}</dd></div>
          ))}
        </dl>
      </section>
    </div>
  );
}

export default function MembersPanel(props: Props) {
  return (
    <QueryProvider>
      <Panel {...props} />
    </QueryProvider>
  );
}
