import { useEffect, useState } from 'react';
import { When } from '../ui/When';
import { useMutation, useQuery, useQueryClient } from '@tanstack/react-query';
import { QueryProvider } from '../QueryProvider';
import { api, ApiError } from '../../lib/client/api';
import { fieldKeys } from '../../lib/client/keys';
import { FIELD_LOG_LABELS, FIELD_LOG_KINDS } from '../../lib/schemas/field';
import { PhotoPicker, type Uploaded } from './PhotoPicker';
import { Thumb } from './Thumb';
import { FoundPortFields, foundPortBody, NO_PORT, type FoundPort } from './FoundPortFields';
import { ProposalOutcome } from './ProposalOutcome';
import type { Proposal } from './proposal-parts';
import { flushOutbox, OUTBOX_EVENT, queueEntry } from '../../lib/client/offline/outbox';
import { offlineKeys } from '../../lib/client/keys';
import type { Scope } from '../../lib/client/offline/store';
import { OutboxList } from '../offline/OutboxList';

type Kind = (typeof FIELD_LOG_KINDS)[number];
interface Annotation { id: string; note: string; userName: string; createdAt: string }
interface Entry {
  id: string; kind: Kind; note: string; newSerialNumber: string; appliedVersion: number | null; foundSettings: string;
  deviceVersion: number; userName: string; createdAt: string; doneAt: string | null; annotations: Annotation[];
  photos: { id: string; url: string; fileName: string }[];
  files?: { id: string; url: string; fileName: string }[];
  proposal: Proposal | null;
}
interface Props {
  deviceId: string; cardRevision: number; canCreate: boolean; canAnnotate: boolean; limit?: number; ports?: { id: string; name: string }[];
  /** Who is signed in and in which team: entries written without a network wait on this phone for them. */
  scope?: Scope; deviceTag?: string;
}

/** Whether the browser says it is offline; false on the server and at hydration, then the browser's. */
function useOffline(): boolean {
  const [offline, setOffline] = useState(false);
  useEffect(() => {
    const update = () => setOffline(!navigator.onLine);
    update();
    window.addEventListener('online', update);
    window.addEventListener('offline', update);
    return () => { window.removeEventListener('online', update); window.removeEventListener('offline', update); };
  }, []);
  return offline;
}


function NewEntry({ deviceId, cardRevision, ports, scope, deviceTag }: { deviceId: string; cardRevision: number; ports: { id: string; name: string }[]; scope?: Scope; deviceTag?: string }) {
  const qc = useQueryClient();
  const offline = useOffline();
  const [localPhotos, setLocalPhotos] = useState<File[]>([]);
  const [queued, setQueued] = useState(false);
  const [kind, setKind] = useState<Kind>('verified');
  const [serial, setSerial] = useState('');
  const [applied, setApplied] = useState(String(cardRevision));
  const [found, setFound] = useState('');
  const [firmware, setFirmware] = useState('');
  const [foundSerial, setFoundSerial] = useState('');
  const [foundPort, setFoundPort] = useState<FoundPort>(NO_PORT);
  const [note, setNote] = useState('');
  const [photos, setPhotos] = useState<Uploaded[]>([]);
  const body = () => ({
    kind, note,
    ...(kind === 'replacement' ? { newSerialNumber: serial, appliedVersion: Number(applied), firmware } : {}),
    ...(kind === 'found-different' ? { foundSettings: found, serialNumber: foundSerial, firmware, port: foundPortBody(foundPort) } : {}),
  });
  const reset = () => { setSerial(''); setFound(''); setNote(''); setPhotos([]); setLocalPhotos([]); setFirmware(''); setFoundSerial(''); setFoundPort(NO_PORT); };
  const m = useMutation({
    mutationFn: () => api<Entry>(`/api/devices/${deviceId}/field-log`, { body: { ...body(), photoIds: photos.map((p) => p.id) } }),
    onSuccess: () => {
      reset();
      qc.invalidateQueries({ queryKey: fieldKeys.log(deviceId) });
      qc.invalidateQueries({ queryKey: fieldKeys.proposals(deviceId) });
    },
  });
  // Without a network (or with photos taken without one) the entry waits on this phone, with the time it was written.
  const keepOnPhone = useMutation({
    mutationFn: async () => {
      if (!scope) throw new Error('Sign in again to keep entries on this phone.');
      await queueEntry({
        userId: scope.userId, teamId: scope.teamId, deviceId, deviceTag: deviceTag ?? deviceId, body: body(), doneAt: new Date().toISOString(),
        photos: [
          ...photos.map((p) => ({ name: p.fileName, type: '', blob: new Blob(), uploadedId: p.id })),
          ...localPhotos.map((f) => ({ name: f.name, type: f.type, blob: f })),
        ],
      });
      if (navigator.onLine) void flushOutbox(scope);
    },
    onSuccess: () => { reset(); setQueued(true); qc.invalidateQueries({ queryKey: offlineKeys.all() }); },
  });
  const submit = () => {
    setQueued(false);
    if (scope && (!navigator.onLine || localPhotos.length > 0)) keepOnPhone.mutate();
    else m.mutate();
  };
  const fields = m.error instanceof ApiError ? m.error.fields : {};
  return (
    <form className="card grid gap-3" onSubmit={(e) => { e.preventDefault(); submit(); }} aria-label="New field-log entry">
      <h2>Log what you did</h2>
      {offline && scope && <p className="notice notice-warn" role="status" data-testid="offline-note">No network: the entry waits on this phone, with the time you save it, and is sent when the network returns.</p>}
      <fieldset className="grid gap-2 sm:grid-cols-3">
        <legend className="label">What happened</legend>
        {FIELD_LOG_KINDS.map((k) => (
          <label key={k} className={`flex items-center gap-2 rounded-md border-2 p-3 text-base font-semibold cursor-pointer ${kind === k ? 'border-ink bg-ink text-white' : 'border-line bg-white'}`}>
            <input type="radio" name="kind" value={k} checked={kind === k} onChange={() => setKind(k)} className="size-5" />
            {FIELD_LOG_LABELS[k]}
          </label>
        ))}
      </fieldset>
      {kind === 'replacement' && (
        <div className="grid gap-3 sm:grid-cols-2">
          <label className="grid gap-1"><span className="label">Serial number of the unit fitted</span>
            <input className="input text-lg" value={serial} onChange={(e) => setSerial(e.target.value)} aria-invalid={!!fields.newSerialNumber} autoComplete="off" />
            {fields.newSerialNumber && <span className="field-error">{fields.newSerialNumber}</span>}</label>
          <label className="grid gap-1"><span className="label">Settings loaded from card revision</span>
            <input className="input text-lg" type="number" inputMode="numeric" min={1} max={cardRevision} value={applied} onChange={(e) => setApplied(e.target.value)} aria-invalid={!!fields.appliedVersion} />
            {fields.appliedVersion && <span className="field-error">{fields.appliedVersion}</span>}</label>
          <label className="grid gap-1"><span className="label">Firmware of the unit fitted (if shown)</span>
            <input className="input text-lg" value={firmware} onChange={(e) => setFirmware(e.target.value)} aria-invalid={!!fields.firmware} autoComplete="off" />
            {fields.firmware && <span className="field-error">{fields.firmware}</span>}</label>
        </div>
      )}
      {kind === 'found-different' && (
        <label className="grid gap-1"><span className="label">What you found set on the device</span>
          <textarea className="input text-lg" rows={3} value={found} onChange={(e) => setFound(e.target.value)} placeholder="e.g. 19200 8-E-1, address 4, termination off" aria-invalid={!!fields.foundSettings} />
          {fields.foundSettings && <span className="field-error">{fields.foundSettings}</span>}</label>
      )}
      {kind === 'found-different' && (
        <div className="grid gap-3 sm:grid-cols-2">
          <label className="grid gap-1"><span className="label">Serial number on the unit, if not the record's</span>
            <input className="input" value={foundSerial} onChange={(e) => setFoundSerial(e.target.value)} aria-invalid={!!fields.serialNumber} autoComplete="off" />
            {fields.serialNumber && <span className="field-error">{fields.serialNumber}</span>}</label>
          <label className="grid gap-1"><span className="label">Firmware on the unit, if not the record's</span>
            <input className="input" value={firmware} onChange={(e) => setFirmware(e.target.value)} aria-invalid={!!fields.firmware} autoComplete="off" />
            {fields.firmware && <span className="field-error">{fields.firmware}</span>}</label>
        </div>
      )}
      {kind === 'found-different' && <FoundPortFields ports={ports} value={foundPort} onChange={setFoundPort} errors={fields} />}
      {(kind === 'replacement' || kind === 'found-different') && <p className="text-sm text-muted">An engineer reviews what you enter here before the record changes; you see the outcome on this entry.</p>}
      <label className="grid gap-1"><span className="label">Note</span>
        <textarea className="input" rows={2} value={note} onChange={(e) => setNote(e.target.value)} /></label>
      <PhotoPicker deviceId={deviceId} photos={photos} onChange={setPhotos}
        kept={scope ? { files: localPhotos, onChange: setLocalPhotos } : undefined} />
      {m.isError && <p className="notice notice-bad" role="alert">{m.error.message}</p>}
      {keepOnPhone.isError && <p className="notice notice-bad" role="alert">{keepOnPhone.error.message}</p>}
      {m.isSuccess && !queued && <p className="notice notice-ok" role="status">Entry saved to the field log.</p>}
      {queued && <p className="notice notice-ok" role="status" data-testid="entry-kept">Entry kept on this phone: it is sent when the network returns (see below).</p>}
      <button className="btn justify-center text-lg min-h-12" disabled={m.isPending || keepOnPhone.isPending}>{m.isPending ? 'Saving…' : offline && scope ? 'Keep entry on this phone' : 'Save entry'}</button>
      <p className="text-sm text-muted">Entries cannot be edited afterwards; add an annotation to correct or complete one.</p>
    </form>
  );
}

function Annotate({ entry, deviceId }: { entry: Entry; deviceId: string }) {
  const qc = useQueryClient();
  const [note, setNote] = useState('');
  const m = useMutation({
    mutationFn: () => api(`/api/field-log/${entry.id}/annotations`, { body: { note } }),
    onSuccess: () => { setNote(''); qc.invalidateQueries({ queryKey: fieldKeys.log(deviceId) }); },
  });
  return (
    <form className="flex flex-wrap gap-2 mt-2" onSubmit={(e) => { e.preventDefault(); m.mutate(); }}>
      <label className="sr-only" htmlFor={`ann-${entry.id}`}>Annotation</label>
      <input id={`ann-${entry.id}`} className="input flex-1 min-w-48" value={note} onChange={(e) => setNote(e.target.value)} placeholder="Add an annotation" />
      <button className="btn btn-quiet min-h-11" disabled={m.isPending}>Annotate</button>
      {m.isError && <p className="field-error w-full" role="alert">{m.error.message}</p>}
    </form>
  );
}

function EntryItem({ e, deviceId, canAnnotate }: { e: Entry; deviceId: string; canAnnotate: boolean }) {
  return (
    <li className="card grid gap-1" data-testid="log-entry" data-kind={e.kind}>
      <p className="font-semibold text-lg">{FIELD_LOG_LABELS[e.kind]}</p>
      <p className="text-sm text-muted">
        {e.doneAt && Math.abs(new Date(e.doneAt).getTime() - new Date(e.createdAt).getTime()) > 60_000
          ? <>Done <When iso={e.doneAt} />, received <When iso={e.createdAt} /></>
          : <When iso={e.createdAt} />} · {e.userName} · card revision {e.deviceVersion}
      </p>
      {e.kind === 'replacement' && <p>New unit S/N <strong className="mono">{e.newSerialNumber}</strong>, settings from card revision <strong>{e.appliedVersion}</strong></p>}
      {e.kind === 'found-different' && <p>Found on site: <strong className="whitespace-pre-wrap">{e.foundSettings}</strong></p>}
      {e.note && <p className="whitespace-pre-wrap">{e.note}</p>}
      {e.proposal && <ProposalOutcome p={e.proposal} />}
      {e.photos.length > 0 && <div className="flex flex-wrap gap-2">{e.photos.map((p) => <Thumb key={p.id} url={p.url} name={p.fileName} />)}</div>}
      {!!e.files?.length && <ul className="text-sm" aria-label="Files">{e.files.map((f) => <li key={f.id}><a href={f.url} download={f.fileName} data-testid="log-file">{f.fileName}</a></li>)}</ul>}
      {e.annotations.length > 0 && (
        <ul className="mt-1 border-l-4 border-line pl-3 grid gap-1" aria-label="Annotations">
          {e.annotations.map((a) => <li key={a.id} className="text-sm"><span className="text-muted"><When iso={a.createdAt} /> · {a.userName}:</span> {a.note}</li>)}
        </ul>
      )}
      {canAnnotate && <Annotate entry={e} deviceId={deviceId} />}
    </li>
  );
}

function Panel({ deviceId, cardRevision, canCreate, canAnnotate, limit, ports = [], scope, deviceTag }: Props) {
  const qc = useQueryClient();
  const q = useQuery({ queryKey: fieldKeys.log(deviceId), queryFn: () => api<{ items: Entry[] }>(`/api/devices/${deviceId}/field-log`) });
  // An entry sent from this phone's outbox shows in the log at once.
  useEffect(() => {
    const sent = () => qc.invalidateQueries({ queryKey: fieldKeys.log(deviceId) });
    window.addEventListener(OUTBOX_EVENT, sent);
    return () => window.removeEventListener(OUTBOX_EVENT, sent);
  }, [qc, deviceId]);
  const items = q.data?.items ?? [];
  const shown = limit ? items.slice(0, limit) : items;
  return (
    <div className="grid gap-4">
      {canCreate && <NewEntry deviceId={deviceId} cardRevision={cardRevision} ports={ports} scope={scope} deviceTag={deviceTag} />}
      {scope && <OutboxList scope={scope} deviceId={deviceId} />}
      <section className="grid gap-2" aria-label="Field log">
        <h2>Field log</h2>
        {q.isPending && <p>Loading the field log…</p>}
        {q.isError && <p className="notice notice-bad" role="alert">{q.error.message}</p>}
        {q.isSuccess && items.length === 0 && <p className="text-muted">Nothing logged at this device yet.</p>}
        <ul className="grid gap-2">{shown.map((e) => <EntryItem key={e.id} e={e} deviceId={deviceId} canAnnotate={canAnnotate} />)}</ul>
        {limit && items.length > limit && <p><a href={`/field/devices/${deviceId}/log`}>All {items.length} entries</a></p>}
      </section>
    </div>
  );
}

export default function FieldLogPanel(props: Props) {
  return <QueryProvider><Panel {...props} /></QueryProvider>;
}
