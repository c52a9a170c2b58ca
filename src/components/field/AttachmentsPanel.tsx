import { useRef, useState } from 'react';
import { useMutation, useQuery, useQueryClient } from '@tanstack/react-query';
import { QueryProvider } from '../QueryProvider';
import { api } from '../../lib/client/api';
import { fieldKeys } from '../../lib/client/keys';
import { ATTACHMENT_KINDS } from '../../lib/schemas/field';
import { formatBytes, KIND_LABELS, type AttachmentKind } from '../../lib/field/files';
import { Progress, uploadFile } from './xhr';
import { Thumb } from './Thumb';

interface Item { id: string; kind: AttachmentKind; fileName: string; size: number; userName: string; createdAt: string; url: string; image: boolean; entryId: string | null }
interface Props { ownerType: 'device' | 'machine'; ownerId: string; canUpload: boolean; canDelete: boolean }

function Upload({ ownerType, ownerId, maxBytes }: { ownerType: Props['ownerType']; ownerId: string; maxBytes: number }) {
  const qc = useQueryClient();
  const [kind, setKind] = useState<AttachmentKind>('manual');
  const [file, setFile] = useState<File | null>(null);
  const [progress, setProgress] = useState<number | null>(null);
  const [message, setMessage] = useState<{ ok: boolean; text: string } | null>(null);
  const formRef = useRef<HTMLFormElement>(null);
  const upload = useMutation({
    mutationFn: (f: File) => uploadFile<Item>({ ownerType, ownerId, kind }, f, setProgress),
    onMutate: () => { setMessage(null); setProgress(0); },
    onSuccess: (saved) => {
      setMessage({ ok: true, text: `Uploaded ${saved.fileName}.` });
      setFile(null);
      formRef.current?.reset();
      qc.invalidateQueries({ queryKey: fieldKeys.attachments(ownerType, ownerId) });
    },
    onError: (err) => setMessage({ ok: false, text: err.message }),
    onSettled: () => setProgress(null),
  });
  function send(e: React.FormEvent) {
    e.preventDefault();
    if (!file) return setMessage({ ok: false, text: 'Choose a file first.' });
    if (file.size > maxBytes) return setMessage({ ok: false, text: `${file.name} is ${formatBytes(file.size)}; the limit is ${formatBytes(maxBytes)}.` });
    upload.mutate(file);
  }
  return (
    <form ref={formRef} className="grid gap-2 sm:grid-cols-[14rem_1fr_auto] sm:items-end" onSubmit={send} aria-label="Upload a file">
      <label className="grid gap-1"><span className="label">Kind</span>
        <select className="input" value={kind} onChange={(e) => setKind(e.target.value as AttachmentKind)}>
          {ATTACHMENT_KINDS.map((k) => <option key={k} value={k}>{KIND_LABELS[k]}</option>)}
        </select></label>
      <label className="grid gap-1"><span className="label">File (up to {formatBytes(maxBytes)})</span>
        <input type="file" className="input" data-testid="attachment-input" onChange={(e) => setFile(e.target.files?.[0] ?? null)}
          accept={kind === 'manual' ? 'application/pdf,.pdf' : kind === 'photo' ? 'image/jpeg,image/png,image/webp' : undefined} /></label>
      <button className="btn justify-center min-h-11" disabled={progress !== null}>Upload</button>
      {progress !== null && <div className="sm:col-span-3"><Progress value={progress} label={`Uploading ${file?.name ?? ''}`} /></div>}
      {message && <p className={`notice sm:col-span-3 ${message.ok ? 'notice-ok' : 'notice-bad'}`} role={message.ok ? 'status' : 'alert'}>{message.text}</p>}
    </form>
  );
}

function Panel({ ownerType, ownerId, canUpload, canDelete }: Props) {
  const qc = useQueryClient();
  const key = fieldKeys.attachments(ownerType, ownerId);
  const q = useQuery({ queryKey: key, queryFn: () => api<{ items: Item[]; maxBytes: number }>(`/api/attachments?ownerType=${ownerType}&ownerId=${encodeURIComponent(ownerId)}`) });
  const remove = useMutation({ mutationFn: (id: string) => api(`/api/attachments/${id}`, { method: 'DELETE' }), onSuccess: () => qc.invalidateQueries({ queryKey: key }) });
  const items = q.data?.items ?? [];
  return (
    <section className="card grid gap-3" aria-label="Files">
      <h2>Manuals, photos and configuration files</h2>
      {q.isPending && <p>Loading files…</p>}
      {q.isError && <p className="notice notice-bad" role="alert">{q.error.message}</p>}
      {q.isSuccess && items.length === 0 && <p className="text-muted">No files yet.</p>}
      <ul className="divide-y divide-line" data-testid="attachments">
        {items.map((a) => (
          <li key={a.id} className="py-2 flex flex-wrap items-center gap-3">
            {a.image && <Thumb url={a.url} name={a.fileName} size={64} />}
            <div className="min-w-0 flex-1">
              <a href={a.url} className="font-semibold break-all" target={a.kind === 'config' ? undefined : '_blank'} rel="noopener">{a.fileName}</a>
              <p className="text-sm text-muted">{KIND_LABELS[a.kind]} · {formatBytes(a.size)} · {a.userName} · {new Date(a.createdAt).toLocaleDateString()}{a.entryId && ' · in the field log'}</p>
            </div>
            {canDelete && !a.entryId && (
              <button className="btn btn-quiet btn-sm" onClick={() => confirm(`Remove ${a.fileName}?`) && remove.mutate(a.id)}>Remove</button>
            )}
          </li>
        ))}
      </ul>
      {remove.isError && <p className="notice notice-bad" role="alert">{remove.error.message}</p>}
      {canUpload && q.data && <Upload ownerType={ownerType} ownerId={ownerId} maxBytes={q.data.maxBytes} />}
    </section>
  );
}

export default function AttachmentsPanel(props: Props) {
  return <QueryProvider><Panel {...props} /></QueryProvider>;
}
