/** The generated Structured Text with a name prefix, Copy and download: loaded (with the generator) when the panel opens. */
import { useEffect, useMemo, useState } from 'react';
import { generatePlcCode } from '../../lib/frame/plc-code/generate';
import type { Template } from '../../lib/frame/template';
import { CopyButton } from '../ui/CopyButton';

export default function PlcCodePanel({ template, name }: { template: Template; name: string }) {
  const [prefix, setPrefix] = useState('');
  const result = useMemo(() => generatePlcCode([{ template }], { name: name.trim() || 'Command', prefix: prefix.trim() }), [template, name, prefix]);
  const file = useMemo(() => (result.ok ? URL.createObjectURL(new Blob([result.value.code], { type: 'text/plain' })) : null), [result]);
  useEffect(() => () => { if (file) URL.revokeObjectURL(file); }, [file]);
  return (
    <div className="grid gap-3 mt-3">
      <label className="text-sm flex items-center gap-2">Name prefix
        <input className="input !py-1 !w-40 mono" value={prefix} onChange={(e) => setPrefix(e.target.value)} placeholder="e.g. DRV_" maxLength={32} />
      </label>
      {!result.ok && <p className="notice notice-bad text-sm" role="alert">{result.error.message}.</p>}
      {result.ok && (
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
  );
}
