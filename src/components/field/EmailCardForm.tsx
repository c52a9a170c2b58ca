import { useState } from 'react';
import { useMutation } from '@tanstack/react-query';
import { QueryProvider } from '../QueryProvider';
import { api } from '../../lib/client/api';

/** Sends this card's settings as text to an e-mail address (engineers and above). */
function Form({ deviceId }: { deviceId: string }) {
  const [to, setTo] = useState('');
  const [message, setMessage] = useState('');
  const m = useMutation({ mutationFn: () => api<{ to: string }>('/api/field/card-email', { body: { deviceId, to, message } }) });
  return (
    <form className="card grid gap-2" onSubmit={(e) => { e.preventDefault(); m.mutate(); }} aria-label="E-mail this card">
      <h2>E-mail this card</h2>
      <label className="grid gap-1"><span className="label">To</span><input className="input" type="email" value={to} onChange={(e) => setTo(e.target.value)} autoComplete="email" /></label>
      <label className="grid gap-1"><span className="label">Message (optional)</span><textarea className="input" rows={2} value={message} onChange={(e) => setMessage(e.target.value)} /></label>
      <button className="btn justify-center min-h-11" disabled={m.isPending}>Send card</button>
      {m.isError && <p className="notice notice-bad" role="alert">{m.error.message}</p>}
      {m.isSuccess && <p className="notice notice-ok" role="status">Card sent to {m.data.to}.</p>}
    </form>
  );
}

export default function EmailCardForm(props: { deviceId: string }) {
  return <QueryProvider><Form {...props} /></QueryProvider>;
}
