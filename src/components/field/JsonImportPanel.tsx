import { useState } from 'react';
import { useMutation } from '@tanstack/react-query';
import { QueryProvider } from '../QueryProvider';
import { ApiError } from '../../lib/client/api';
import { Progress, sendWithProgress } from './xhr';

type Counts = Record<string, { create: number; existing: number }>;
interface Result { applied: boolean; source: { team: string; scope: string }; counts: Counts }

/** Reads an export file, previews what would be created here, then applies it in one go. */
function Panel() {
  const [doc, setDoc] = useState<unknown>(null);
  const [name, setName] = useState('');
  const [readError, setReadError] = useState<string | null>(null);
  const [progress, setProgress] = useState<number | null>(null);
  const send = (apply: boolean) => sendWithProgress<Result>('POST', '/api/import', JSON.stringify({ document: doc, apply }), setProgress, 'application/json').finally(() => setProgress(null));
  const preview = useMutation({ mutationFn: () => send(false) });
  const apply = useMutation({ mutationFn: () => send(true) });
  async function pick(file: File | undefined) {
    preview.reset(); apply.reset(); setReadError(null); setDoc(null);
    if (!file) return;
    setName(file.name);
    try {
      setDoc(JSON.parse(await file.text()));
    } catch {
      setReadError(`${file.name} is not a JSON file.`);
    }
  }
  const problems = (preview.error ?? apply.error) instanceof ApiError ? (((preview.error ?? apply.error) as ApiError).body.problems as string[] | undefined) : undefined;
  const shown = apply.data ?? preview.data;
  return (
    <section className="card grid gap-3" aria-label="Import a JSON export">
      <h2>Import an export file</h2>
      <label className="grid gap-1"><span className="label">Export file (.json)</span>
        <input type="file" accept="application/json,.json" className="input" onChange={(e) => pick(e.target.files?.[0])} data-testid="json-import-input" /></label>
      {readError && <p className="notice notice-bad" role="alert">{readError}</p>}
      {doc !== null && !preview.data && <button className="btn justify-self-start" onClick={() => preview.mutate()} disabled={preview.isPending}>Preview {name}</button>}
      {progress !== null && <Progress value={progress} label="Sending the file" />}
      {(preview.error ?? apply.error) && <div className="notice notice-bad" role="alert"><p>{(preview.error ?? apply.error)!.message}</p>
        {problems && problems.length > 1 && <ul className="list-disc pl-5 text-sm">{problems.map((p) => <li key={p}>{p}</li>)}</ul>}</div>}
      {shown && (
        <div className="grid gap-2">
          <p>{shown.applied ? 'Imported' : 'Would import'} from <strong>{shown.source.team}</strong> ({shown.source.scope}):</p>
          <table className="table max-w-md" data-testid="import-counts">
            <thead><tr><th>Records</th><th>New</th><th>Already here</th></tr></thead>
            <tbody>{Object.entries(shown.counts).map(([k, c]) => <tr key={k}><td>{k}</td><td>{c.create}</td><td>{c.existing}</td></tr>)}</tbody>
          </table>
          {!shown.applied && <button className="btn justify-self-start" onClick={() => apply.mutate()} disabled={apply.isPending || Object.values(shown.counts).every((c) => c.create === 0)}>Import into this team</button>}
          {shown.applied && <p className="notice notice-ok" role="status">Done. Importing the same file again adds nothing new.</p>}
        </div>
      )}
    </section>
  );
}

export default function JsonImportPanel() {
  return <QueryProvider><Panel /></QueryProvider>;
}
