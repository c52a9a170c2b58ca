/** "Save as profile": keep this device's role, maker, model and ports as a reusable device type. */
import { useState } from 'react';
import { useMutation } from '@tanstack/react-query';
import { api, ApiError } from '../../lib/client/api';
import { QueryProvider } from '../QueryProvider';

function Saver({ deviceId, suggested }: { deviceId: string; suggested: string }) {
  const [name, setName] = useState(suggested);
  const m = useMutation({ mutationFn: () => api<{ id: string; name: string }>(`/api/devices/${deviceId}/profile`, { body: { name } }) });
  const fieldError = m.error instanceof ApiError ? m.error.fields.name : undefined;
  return (
    <form className="flex flex-wrap items-end gap-2" onSubmit={(e) => { e.preventDefault(); m.mutate(); }} noValidate>
      <label className="grow"><span className="label">Profile name</span>
        <input className="input" value={name} onChange={(e) => setName(e.target.value)} aria-invalid={!!fieldError} />
      </label>
      <button className="btn btn-quiet" disabled={m.isPending}>Save as profile</button>
      {fieldError && <p className="field-error w-full" role="alert">{fieldError}</p>}
      {m.isError && !fieldError && <p className="field-error w-full" role="alert">{m.error.message}</p>}
      {m.isSuccess && <p className="text-sm text-ok w-full" role="status">Saved as <a href={`/vault/profiles/${m.data.id}`}>{m.data.name}</a>. Node addresses were left blank in the profile.</p>}
    </form>
  );
}

export default function SaveAsProfile(props: { deviceId: string; suggested: string }) {
  return (
    <QueryProvider>
      <Saver {...props} />
    </QueryProvider>
  );
}
