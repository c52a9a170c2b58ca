import { useMutation, useQueryClient } from '@tanstack/react-query';
import { When } from '../ui/When';
import { offlineKeys } from '../../lib/client/keys';
import { flushOutbox, removeEntry } from '../../lib/client/offline/outbox';
import type { EntryState, QueuedEntry, Scope } from '../../lib/client/offline/store';
import { FIELD_LOG_LABELS } from '../../lib/schemas/field';
import { useOutbox } from './use-offline';

const STATE_TEXT: Record<EntryState, string> = {
  waiting: 'Waiting on this phone: sent when the network returns',
  sending: 'Sending…',
  sent: 'Sent to the field log',
  refused: 'Refused by the server',
};
const STATE_CLASS: Record<EntryState, string> = { waiting: 'notice-warn', sending: 'notice-warn', sent: 'notice-ok', refused: 'notice-bad' };

function Item({ e, showDevice }: { e: QueuedEntry; showDevice: boolean }) {
  const qc = useQueryClient();
  const drop = useMutation({
    mutationFn: () => removeEntry(e.seq!),
    onSuccess: () => qc.invalidateQueries({ queryKey: offlineKeys.all() }),
  });
  const kind = e.body.kind as keyof typeof FIELD_LOG_LABELS;
  return (
    <li className={`notice ${STATE_CLASS[e.state]} grid gap-1`} data-testid="queued-entry" data-state={e.state}>
      <p className="font-semibold">{FIELD_LOG_LABELS[kind] ?? kind}{showDevice && <> · <a href={`/field/devices/${e.deviceId}`}>{e.deviceTag}</a></>}</p>
      <p className="text-sm">Done <When iso={e.doneAt} />{e.photos.length > 0 && ` · ${e.photos.length} photo${e.photos.length > 1 ? 's' : ''}`}{e.sentAt && <> · sent <When iso={e.sentAt} /></>}</p>
      {typeof e.body.note === 'string' && e.body.note && <p className="text-sm whitespace-pre-wrap">{e.body.note}</p>}
      <p className="text-sm font-semibold" data-testid="queued-state">{STATE_TEXT[e.state]}</p>
      {e.state === 'refused' && <p className="text-sm" data-testid="queued-reason">{e.reason}</p>}
      {(e.state === 'refused' || e.state === 'sent') && (
        <button type="button" className="btn btn-quiet btn-sm justify-self-start" onClick={() => drop.mutate()} disabled={drop.isPending}>Remove from this phone</button>
      )}
    </li>
  );
}

/** Entries written on this phone (for one device, or all), each with where it stands; a "send now" button. */
export function OutboxList({ scope, deviceId }: { scope: Scope; deviceId?: string }) {
  const qc = useQueryClient();
  const q = useOutbox(scope, deviceId);
  const send = useMutation({ mutationFn: () => flushOutbox(scope), onSettled: () => qc.invalidateQueries({ queryKey: offlineKeys.all() }) });
  const items = q.data ?? [];
  if (!items.length) return deviceId ? null : <p className="text-muted">No entries written on this phone are waiting.</p>;
  const waiting = items.some((e) => e.state === 'waiting');
  return (
    <section className="grid gap-2" aria-label="Entries written on this phone">
      <h2 className="text-lg">Written on this phone</h2>
      <ul className="grid gap-2">{items.map((e) => <Item key={e.seq} e={e} showDevice={!deviceId} />)}</ul>
      {waiting && <button type="button" className="btn btn-quiet justify-self-start" onClick={() => send.mutate()} disabled={send.isPending}>{send.isPending ? 'Sending…' : 'Send now'}</button>}
    </section>
  );
}
