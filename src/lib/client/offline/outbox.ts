/**
 * Field-log entries written without a network wait here (IndexedDB, store.ts) with the time the work was done,
 * and are sent in the order written: on the `online` event and on every page load (no Background Sync). A send
 * that fails for want of a network (or a server error) stops the round, so no later entry overtakes it; one the
 * server refuses stays on the phone, marked refused with the server's reason.
 */
import { getAll, put, remove, type QueuedEntry, type QueuedPhoto, type Scope } from './store';

export const OUTBOX_EVENT = 'baudbook:outbox';
const notify = () => window.dispatchEvent(new Event(OUTBOX_EVENT));

/** A key of the phone's own for each entry, so a resend after a lost answer writes nothing twice. */
export function newClientKey(): string {
  return `ck_${crypto.randomUUID().replaceAll('-', '')}`;
}

export async function queueEntry(entry: Omit<QueuedEntry, 'seq' | 'state' | 'clientKey'>): Promise<void> {
  await put('outbox', { ...entry, clientKey: newClientKey(), state: 'waiting' } satisfies QueuedEntry);
  notify();
}

export async function outboxEntries(scope: Scope | null): Promise<QueuedEntry[]> {
  const all = await getAll<QueuedEntry>('outbox');
  return all.filter((e) => !scope || (e.userId === scope.userId && e.teamId === scope.teamId)).sort((a, b) => a.seq! - b.seq!);
}

export const unsent = (entries: QueuedEntry[]) => entries.filter((e) => e.state === 'waiting' || e.state === 'sending');

export async function removeEntry(seq: number): Promise<void> {
  await remove('outbox', seq);
  notify();
}

class Transient extends Error {}

/** The server's refusal in words: its message and each field's. */
function reasonOf(status: number, data: { error?: string; fields?: Record<string, string> } | null): string {
  const error = data?.error ?? `Refused (${status}).`;
  const fields = Object.values(data?.fields ?? {}).filter((m) => !error.includes(m));
  return [error, ...fields].join(' ');
}

/** 401 (signed out meanwhile), 408, 429 and 5xx are worth another try; other refusals are final. */
const transient = (status: number) => status === 401 || status === 408 || status === 429 || status >= 500;

async function send(url: string, init: RequestInit): Promise<any> {
  let res: Response;
  try {
    res = await fetch(url, { ...init, credentials: 'same-origin' });
  } catch {
    throw new Transient('No network.');
  }
  const data = await res.json().catch(() => null);
  if (res.ok) return data;
  if (transient(res.status)) throw new Transient(reasonOf(res.status, data));
  throw new Error(reasonOf(res.status, data));
}

async function uploadPhoto(deviceId: string, photo: QueuedPhoto): Promise<string> {
  const form = new FormData();
  form.append('ownerType', 'device');
  form.append('ownerId', deviceId);
  form.append('kind', 'photo');
  form.append('file', photo.blob, photo.name);
  return (await send('/api/attachments', { method: 'POST', body: form })).id;
}

let round: Promise<void> | null = null;

/** Sends the waiting entries of this user and team, oldest first; one round at a time per page. */
export function flushOutbox(scope: Scope): Promise<void> {
  round ??= flush(scope).finally(() => { round = null; });
  return round;
}

async function flush(scope: Scope): Promise<void> {
  for (const entry of unsent(await outboxEntries(scope))) {
    await put('outbox', { ...entry, state: 'sending' });
    notify();
    try {
      for (const photo of entry.photos) {
        if (photo.uploadedId) continue;
        photo.uploadedId = await uploadPhoto(entry.deviceId, photo);
        await put('outbox', { ...entry, state: 'sending' });
      }
      const photoIds = entry.photos.map((p) => p.uploadedId!);
      await send(`/api/devices/${entry.deviceId}/field-log`, {
        method: 'POST',
        headers: { 'content-type': 'application/json' },
        body: JSON.stringify({ ...entry.body, photoIds, doneAt: entry.doneAt, clientKey: entry.clientKey }),
      });
      // Sent: the photos' bytes are on the server now; the phone keeps only the record of the send.
      await put('outbox', { ...entry, photos: entry.photos.map((p) => ({ ...p, blob: new Blob() })), state: 'sent', sentAt: new Date().toISOString() });
    } catch (err) {
      if (err instanceof Transient) {
        await put('outbox', { ...entry, state: 'waiting' });
        notify();
        return;
      }
      await put('outbox', { ...entry, state: 'refused', reason: (err as Error).message });
    }
    notify();
  }
}
