import { useState } from 'react';
import { useMutation } from '@tanstack/react-query';
import Papa from 'papaparse';
import { QueryProvider } from '../QueryProvider';
import { ApiError } from '../../lib/client/api';
import { CSV_FIELDS, guessMapping, type CsvMapping } from '../../lib/field/csv';
import { Progress, sendWithProgress } from './xhr';

interface Preview { applied: boolean; rows: number; devices: number; ports: number; errorCount: number; errors: { row: number; column: string; message: string }[]; sample: { tag: string; ports: string[] }[] }
interface Props { machines: { id: string; label: string }[] }

/** CSV → devices and ports of one machine: read locally (with progress), map columns, preview on the server, then confirm. */
function Panel({ machines }: Props) {
  const [machineId, setMachineId] = useState(machines[0]?.id ?? '');
  const [csv, setCsv] = useState('');
  const [headers, setHeaders] = useState<string[]>([]);
  const [rows, setRows] = useState(0);
  const [mapping, setMapping] = useState<CsvMapping>({});
  const [progress, setProgress] = useState<{ label: string; value: number } | null>(null);
  const [preview, setPreview] = useState<Preview | null>(null);
  const [error, setError] = useState<string | null>(null);
  const [skipInvalid, setSkipInvalid] = useState(false);

  function read(file: File | undefined) {
    setPreview(null); setError(null); setHeaders([]); setCsv('');
    if (!file) return;
    let count = 0;
    let fields: string[] = [];
    Papa.parse<Record<string, string>>(file, {
      header: true, skipEmptyLines: 'greedy', chunkSize: 256 * 1024,
      chunk: (res) => { count += res.data.length; fields = res.meta.fields ?? fields; setProgress({ label: `Reading ${file.name}`, value: Math.min(1, res.meta.cursor / file.size) }); },
      complete: async () => {
        setProgress(null); setRows(count); setHeaders(fields); setMapping(guessMapping(fields)); setCsv(await file.text());
      },
      error: (err) => { setProgress(null); setError(err.message); },
    });
  }
  const importer = useMutation({
    mutationFn: (apply: boolean) =>
      sendWithProgress<Preview>('POST', '/api/import/csv', JSON.stringify({ machineId, csv, mapping, apply, skipInvalid }), (v) => setProgress((p) => p && { ...p, value: v }), 'application/json'),
    onMutate: (apply) => { setError(null); setProgress({ label: apply ? 'Importing' : 'Checking every row', value: 0 }); },
    onSuccess: setPreview,
    onError: (err) => {
      const e = err as ApiError;
      if (e.body?.preview) setPreview(e.body.preview as Preview);
      setError(e.message);
    },
    onSettled: () => setProgress(null),
  });
  const send = (apply: boolean) => importer.mutate(apply);
  return (
    <section className="card grid gap-3" aria-label="Import devices from CSV">
      <h2>Import devices and ports from CSV</h2>
      <p className="text-sm text-muted">One row per port; rows with the same device tag make one device. Nothing is written until you confirm.</p>
      <div className="grid gap-3 sm:grid-cols-2">
        <label className="grid gap-1"><span className="label">Into machine</span>
          <select className="input" value={machineId} onChange={(e) => { setMachineId(e.target.value); setPreview(null); }}>{machines.map((m) => <option key={m.id} value={m.id}>{m.label}</option>)}</select></label>
        <label className="grid gap-1"><span className="label">CSV file</span>
          <input type="file" accept=".csv,text/csv" className="input" onChange={(e) => read(e.target.files?.[0])} data-testid="csv-input" /></label>
      </div>
      {progress && <Progress value={progress.value} label={progress.label} />}
      {headers.length > 0 && (
        <fieldset className="grid gap-2 sm:grid-cols-3" aria-label="Column mapping">
          <legend className="label">Columns ({rows} rows read)</legend>
          {CSV_FIELDS.map((f) => (
            <label key={f.key} className="grid gap-1 text-sm"><span>{f.label}{'required' in f && ' *'}</span>
              <select className="input !py-1" value={mapping[f.key] ?? ''} onChange={(e) => { setMapping({ ...mapping, [f.key]: e.target.value || undefined }); setPreview(null); }}>
                <option value="">— not in the file —</option>{headers.map((h) => <option key={h} value={h}>{h}</option>)}
              </select></label>
          ))}
        </fieldset>
      )}
      {headers.length > 0 && <button className="btn justify-self-start" onClick={() => send(false)} disabled={!!progress || !machineId}>Preview</button>}
      {error && <p className="notice notice-bad" role="alert">{error}</p>}
      {preview && (
        <div className="grid gap-2" data-testid="csv-preview">
          <p>{preview.applied ? 'Imported' : 'Ready to import'}: <strong>{preview.devices}</strong> devices with <strong>{preview.ports}</strong> ports from {preview.rows} rows{preview.errorCount > 0 && <>; <strong className="text-bad">{preview.errorCount} rows have errors</strong></>}.</p>
          {preview.errors.length > 0 && (
            <table className="table text-sm"><thead><tr><th>Row</th><th>Column</th><th>Problem</th></tr></thead>
              <tbody>{preview.errors.map((e, i) => <tr key={i}><td>{e.row}</td><td>{e.column}</td><td>{e.message}</td></tr>)}</tbody></table>
          )}
          {!preview.applied && preview.errorCount > 0 && <label className="flex gap-2 items-center"><input type="checkbox" checked={skipInvalid} onChange={(e) => setSkipInvalid(e.target.checked)} /> Leave out the rows with errors</label>}
          {!preview.applied && <button className="btn justify-self-start" onClick={() => send(true)} disabled={!!progress || preview.devices === 0 || (preview.errorCount > 0 && !skipInvalid)}>Import {preview.devices} devices</button>}
          {preview.applied && <p className="notice notice-ok" role="status">Import finished.</p>}
        </div>
      )}
    </section>
  );
}

export default function CsvImportPanel(props: Props) {
  return <QueryProvider><Panel {...props} /></QueryProvider>;
}
