import { useForm } from 'react-hook-form';
import { zodResolver } from '@hookform/resolvers/zod';
import { useMutation } from '@tanstack/react-query';
import { QueryProvider } from './QueryProvider';
import { FormField } from './FormField';
import { api } from '../lib/client/api';
import { createTeamSchema } from '../lib/schemas/platform';

function Form() {
  const form = useForm({ resolver: zodResolver(createTeamSchema), defaultValues: { name: '' } });
  const m = useMutation({ mutationFn: (v: { name: string }) => api('/api/teams', { body: v }), onSuccess: () => location.assign('/team') });
  return (
    <form onSubmit={form.handleSubmit((v) => m.mutate(v))} noValidate>
      {m.isError && <p className="notice notice-bad mb-3" role="alert">{m.error.message}</p>}
      <FormField id="team-name" label="Team name" error={form.formState.errors.name?.message}>
        <input id="team-name" className="input" aria-invalid={!!form.formState.errors.name} {...form.register('name')} />
      </FormField>
      <button className="btn" disabled={m.isPending}>Create team</button>
    </form>
  );
}

export default function CreateTeamForm() {
  return (
    <QueryProvider>
      <Form />
    </QueryProvider>
  );
}
