/** Asked before a command with error findings is saved (the composer's save and the workbench's save to a device). */
export interface ErrorFinding { code: string; message: string }

export function SaveWithFindings({ errors, busy, onSave, onCancel }: { errors: readonly ErrorFinding[]; busy: boolean; onSave: () => void; onCancel: () => void }) {
  const one = errors.length === 1;
  return (
    <div className="notice notice-warn text-sm grid gap-2 w-full" role="alertdialog" aria-labelledby="save-findings-title" data-testid="save-with-findings">
      <p id="save-findings-title"><b>The preview has {one ? 'an error finding' : `${errors.length} error findings`}</b> ({[...new Set(errors.map((e) => e.code))].join(', ')}). Save anyway? The command's history will say it was saved with {one ? 'it' : 'them'}.</p>
      <ul className="list-disc pl-5">{errors.slice(0, 5).map((e, i) => <li key={i}>{e.message}</li>)}</ul>
      <div className="flex flex-wrap gap-2">
        <button type="button" className="btn btn-sm" disabled={busy} onClick={onSave}>Save with {one ? 'this finding' : 'these findings'}</button>
        <button type="button" className="btn btn-quiet btn-sm" onClick={onCancel}>Not now</button>
      </div>
    </div>
  );
}
