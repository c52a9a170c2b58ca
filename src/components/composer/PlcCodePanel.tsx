/** Structured Text (IEC 61131-3) that builds this command at run time; the generator loads when the panel is opened. */
import { useEffect, useMemo, useState } from 'react';
import type { generatePlcCode as Generate } from '../../lib/frame/plc-code/generate';
import type { Template } from '../../lib/frame/template';
import { CopyButton } from '../ui/CopyButton';

let loaded: typeof Generate | null = null;

export function PlcCodePanel({ template, name }: { template: Template; name: string }) {
  const [open, setOpen] = useState(false);
  const [generate, setGenerate] = useState(() => loaded);
  const [prefix, setPrefix] = useState('');
  useEffect(() => {
    if (!open || generate) return;
    let live = true;
    import('../../lib/frame/plc-code/generate').then((m) => {
      loaded = m.generatePlcCode;
      if (live) setGenerate(() => m.generatePlcCode);
    });
    return () => {
      live = false;
    };
  }, [open, generate]);
  const result = useMemo(() => (open && generate ? generate([{ template }], { name: name.trim() || 'Command', prefix: prefix.trim() }) : null), [open, generate, template, name, prefix]);
  const file = useMemo(() => (result?.ok ? URL.createObjectURL(new Blob([result.value.code], { type: 'text/plain' })) : null), [result]);
  useEffect(() => () => { if (file) URL.revokeObjectURL(file); }, [file]);
  return (
    <details onToggle={(e) => setOpen(e.currentTarget.open)} data-testid="plc-code">
      <summary className="cursor-pointer text-sm">Structured Text that builds this command from its fields at run time</summary>
      {open && (
        <div className="grid gap-3 mt-3">
          <label className="text-sm flex items-center gap-2">Name prefix
            <input className="input !py-1 !w-40 mono" value={prefix} onChange={(e) => setPrefix(e.target.value)} placeholder="e.g. DRV_" maxLength={32} />
          </label>
          {!result && <p className="text-sm text-muted">Loading the generator…</p>}
          {result && !result.ok && <p className="notice notice-bad text-sm" role="alert">{result.error.message}.</p>}
          {result?.ok && (
            <>
              <div className="flex flex-wrap items-center gap-2">
                <CopyButton text={result.value.code} what="PLC code" />
                <a className="btn btn-quiet btn-sm" href={file ?? undefined} download={`${result.value.name}.st`}>Download .st</a>
                <span className="text-sm text-muted">{result.value.form === 'string' ? `FUNCTION returning STRING(${result.value.capacity})` : `FUNCTION_BLOCK filling ARRAY [1..${result.value.capacity}] OF BYTE`}</span>
              </div>
              {result.value.findings.map((f) => <p key={f.message} className="notice text-sm">{f.message}</p>)}
              <pre className="mono text-xs overflow-auto max-h-96 p-2 border rounded" data-testid="plc-code-text">{result.value.code}</pre>
            </>
          )}
        </div>
      )}
    </details>
  );
}
