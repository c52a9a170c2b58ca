/**
 * The session as evidence: download the exchange log (anywhere, the workbench too), or on a device save it to the device's field log as a "communication
 * verified" entry (technicians and above): the text file is uploaded as a configuration file of the device,
 * then the entry claims it.
 */
import { useState } from 'react';
import { useMutation, useQueryClient } from '@tanstack/react-query';
import { api } from '../../lib/client/api';
import { fieldKeys } from '../../lib/client/keys';
import { exchangeLogFileName } from '../../lib/live/exchange-log';
import { uploadFile } from '../field/xhr';

interface Uploaded { id: string; url: string; fileName: string }

/** The exchange log as a configuration file of the device, through the one upload helper. */
function uploadExchangeLog(deviceId: string, name: string, text: string): Promise<Uploaded> {
  return uploadFile<Uploaded>({ ownerType: 'device', ownerId: deviceId, kind: 'config', name }, new File([text], name, { type: 'text/plain' }), () => undefined);
}

const fileName = (label: string, openedAt: Date) => exchangeLogFileName(label.split(' ')[0] ?? label, openedAt);

function DownloadButton({ name, text }: { name: string; text: () => string }) {
  const download = () => {
    const url = URL.createObjectURL(new Blob([text()], { type: 'text/plain' }));
    const a = document.createElement('a');
    a.href = url;
    a.download = name;
    a.click();
    setTimeout(() => URL.revokeObjectURL(url), 1000);
  };
  return <div><button type="button" className="btn btn-quiet" onClick={download}>Download the exchange log</button></div>;
}

/** Where there is no device to keep it (the workbench): the download alone. */
export function ExchangeLogDownload({ label, openedAt, text }: { label: string; openedAt: Date; text: () => string }) {
  return (
    <div className="grid gap-2" data-testid="live-evidence">
      <h3>Keep the exchange log</h3>
      <DownloadButton name={fileName(label, openedAt)} text={text} />
      <p className="text-sm text-muted">To keep it in a field log, open the live link from the device's page.</p>
    </div>
  );
}

export function SaveEvidence({ deviceId, deviceLabel, openedAt, text, canLog, through }: { deviceId: string; deviceLabel: string; openedAt: Date; text: () => string; canLog: boolean; through: string }) {
  const qc = useQueryClient();
  const [note, setNote] = useState('');
  const name = fileName(deviceLabel, openedAt);
  const m = useMutation({
    mutationFn: async () => {
      const file = await uploadExchangeLog(deviceId, name, text());
      return api<{ id: string }>(`/api/devices/${deviceId}/field-log`, { body: { kind: 'verified', note: note || `Communication verified with the live link (${through}); exchange log attached.`, exchangeLogId: file.id } });
    },
    onSuccess: () => qc.invalidateQueries({ queryKey: fieldKeys.log(deviceId) }),
  });
  return (
    <div className="grid gap-2" data-testid="live-evidence">
      <h3>Keep the evidence</h3>
      <DownloadButton name={name} text={text} />
      {canLog ? (
        <form className="grid gap-2" onSubmit={(e) => { e.preventDefault(); m.mutate(); }} aria-label="Save to the field log">
          <label className="grid gap-1"><span className="label">Note for the field log</span>
            <textarea className="input" rows={2} value={note} onChange={(e) => setNote(e.target.value)} placeholder="e.g. Status query answered 10 times, checksum good" /></label>
          <div><button className="btn" disabled={m.isPending}>{m.isPending ? 'Saving…' : 'Save to the field log as communication verified'}</button></div>
          {m.isError && <p className="notice notice-bad" role="alert">{m.error.message}</p>}
          {m.isSuccess && <p className="notice notice-ok" role="status">Saved to the field log with the exchange log attached. <a href={`/field/devices/${deviceId}/log`}>Open the field log</a></p>}
        </form>
      ) : <p className="text-sm text-muted">Technicians and above can save the exchange log to the field log.</p>}
    </div>
  );
}
