import { useMutation } from '@tanstack/react-query';
import { QueryProvider } from '../QueryProvider';
import { signOutHere } from '../../lib/client/offline/forget';
import type { Scope } from '../../lib/client/offline/store';
import { OutboxList } from './OutboxList';
import { useOutbox } from './use-offline';

function Panel({ scope }: { scope: Scope }) {
  const q = useOutbox(scope);
  const out = useMutation({ mutationFn: signOutHere });
  const unsent = (q.data ?? []).filter((e) => e.state === 'waiting' || e.state === 'sending').length;
  return (
    <div className="grid gap-4">
      {unsent > 0 ? (
        <p className="notice notice-bad" role="alert" data-testid="unsent-warning">
          {unsent === 1 ? 'One field-log entry written on this phone has' : `${unsent} field-log entries written on this phone have`} not been sent yet.
          Signing out removes {unsent === 1 ? 'it' : 'them'} from this phone for good. Send {unsent === 1 ? 'it' : 'them'} first when you have a network.
        </p>
      ) : (
        <p>Signing out also removes everything kept on this phone: the kept field cards and the entries written here.</p>
      )}
      <OutboxList scope={scope} />
      <div className="flex flex-wrap gap-2">
        <button type="button" className={unsent > 0 ? 'btn btn-danger' : 'btn'} onClick={() => out.mutate()} disabled={out.isPending}>
          {unsent > 0 ? 'Sign out and remove them' : 'Sign out'}
        </button>
        <a className="btn btn-quiet" href="/field/kept">Stay signed in</a>
      </div>
    </div>
  );
}

/** Signing out on this phone, with the warning about entries not yet sent (the page /sign-out). */
export default function SignOutPanel({ scope }: { scope: Scope }) {
  return <QueryProvider><Panel scope={scope} /></QueryProvider>;
}
