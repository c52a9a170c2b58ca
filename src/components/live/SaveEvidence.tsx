/**
 * The session as evidence: download the exchangeLog, or save it to the device's field log as a "communication
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

export function SaveEvidence({ deviceId, deviceLabel, openedAt, text, canLog, through }: { deviceId: string; deviceLabel: string; openedAt: Date; text: () => string; canLog: boolean; through: string }) {
  const qc = useQueryClient();
  const [note, setNote] = useState('');
  const name = exchangeLogFileName(deviceLabel.split(' ')[0] ?? deviceLabel, openedAt);
  const m = useMutation({
    mutationFn: async () => {
      const file = await uploadExchangeLog(deviceId, name, text());
      return api<{ id: string }>(`/api/devices/${deviceId}/field-log`, { body: { kind: 'verified', note: note || `Communication verified with the live link (${through}); exchange log attached.`, exchangeLogId: file.id } });
    },
    onSuccess: () => qc.invalidateQueries({ queryKey: fieldKeys.log(deviceId) }),
  });
  const download = () => {
    const url = URL.createObjectURL(new Blob([text()], { type: 'text/plain' }));
    const a = document.createElement('a');
    a.href = url;
    a.download = name;
    a.click();
    setTimeout(() => URL.revokeObjectURL(url), 1000);
  };
  return (
    <div className="grid gap-2" data-testid="live-evidence">
      <h3>Keep the evidence</h3>
      <div><button type="button" className="btn btn-quiet" onClick={download}>Download the exchange log</button></div>
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
