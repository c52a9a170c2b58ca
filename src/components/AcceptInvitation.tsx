import { useMutation } from '@tanstack/react-query';
import { QueryProvider } from './QueryProvider';
import { api } from '../lib/client/api';

function Accept({ token, teamName }: { token: string; teamName: string }) {
  const m = useMutation({ mutationFn: () => api('/api/invitations/accept', { body: { token } }), onSuccess: () => location.assign('/team') });
  return (
    <div>
      {m.isError && <p className="notice notice-bad mb-3" role="alert">{m.error.message}</p>}
      <button className="btn" onClick={() => m.mutate()} disabled={m.isPending}>Join {teamName}</button>
    </div>
  );
}

export default function AcceptInvitation(props: { token: string; teamName: string }) {
  return (
    <QueryProvider>
      <Accept {...props} />
    </QueryProvider>
  );
}
