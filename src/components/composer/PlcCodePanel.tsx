/** The generated Structured Text with a name prefix, Copy and download: loaded (with the generator) when the panel opens. */
import { useEffect, useMemo, useState } from 'react';
import { generatePlcCode } from '../../lib/frame/plc-code/generate';
import { plcCodeForSequence } from '../../lib/frame/plc-code/device-file';
import type { SequenceMode } from '../../lib/frame/sequence-limits';
import type { FieldValues, Template } from '../../lib/frame/template';
import { CopyButton } from '../ui/CopyButton';

/** What the code is generated from: one command's template, or a sequence's steps as they stand (or why it cannot be). */
export type PlcCodeSource =
  | { kind: 'command'; template: Template }
  | { kind: 'sequence'; mode: SequenceMode; delayMs: number; steps: { template: Template; values: FieldValues }[]; gap?: string };

export default function PlcCodePanel({ source, name }: { source: PlcCodeSource; name: string }) {
  const [prefix, setPrefix] = useState('');
  const [fixSteps, setFixSteps] = useState(false);
  // The composer hands a new object on every render: the code is generated again only when its content changes.
  const key = JSON.stringify(source);
  const result = useMemo(() => {
    const options = { prefix: prefix.trim() };
    const title = name.trim() || (source.kind === 'command' ? 'Command' : 'Sequence');
    if (source.kind === 'command') {
      const r = generatePlcCode([{ template: source.template }], { name: title, ...options });
      return r.ok ? { ok: true as const, value: { code: r.value.code, file: r.value.name, findings: r.value.findings, shape: r.value.form === 'string' ? `FUNCTION returning STRING(${r.value.capacity})` : `FUNCTION_BLOCK filling ARRAY [1..${r.value.capacity}] OF BYTE` } } : r;
    }
    if (source.gap) return { ok: false as const, error: { message: `Not generated: ${source.gap.replace(/\.$/, '')}` } };
    const steps = source.steps.map((s) => ({ template: s.template, ...(fixSteps ? { fixed: s.values } : {}) }));
    const r = plcCodeForSequence(title, { mode: source.mode, delayMs: source.delayMs, steps }, options);
    return r.ok ? { ok: true as const, value: { code: r.value.code, file: r.value.names[0]!.replace(/_step_1$/i, ''), findings: r.value.findings, shape: r.value.names.length === 1 ? `one POU, ${r.value.names[0]}` : `${r.value.names.length} POUs, one per send` } } : r;
    // eslint-disable-next-line react-hooks/exhaustive-deps
  }, [key, name, prefix, fixSteps]);
  const file = useMemo(() => (result.ok ? URL.createObjectURL(new Blob([result.value.code], { type: 'text/plain' })) : null), [result]);
  useEffect(() => () => { if (file) URL.revokeObjectURL(file); }, [file]);
  return (
    <div className="grid gap-3 mt-3">
      <label className="text-sm flex items-center gap-2">Name prefix
        <input className="input !py-1 !w-40 mono" value={prefix} onChange={(e) => setPrefix(e.target.value)} placeholder="e.g. DRV_" maxLength={32} />
      </label>
      {source.kind === 'sequence' && (
        <label className="text-sm flex items-center gap-2">
          <input type="checkbox" checked={fixSteps} onChange={(e) => setFixSteps(e.target.checked)} />
          Write each step&apos;s values as constants (otherwise every field is an input)
        </label>
      )}
      {!result.ok && <p className="notice notice-bad text-sm" role="alert">{result.error.message}.</p>}
      {result.ok && (
        <>
          <div className="flex flex-wrap items-center gap-2">
            <CopyButton text={result.value.code} what="PLC code" />
            <a className="btn btn-quiet btn-sm" href={file ?? undefined} download={`${result.value.file}.st`}>Download .st</a>
            <span className="text-sm text-muted">{result.value.shape}</span>
          </div>
          {result.value.findings.map((f) => <p key={f.message} className="notice text-sm">{f.message}</p>)}
          <pre className="mono text-xs overflow-auto max-h-96 p-2 border rounded" data-testid="plc-code-text">{result.value.code}</pre>
        </>
      )}
    </div>
  );
}
