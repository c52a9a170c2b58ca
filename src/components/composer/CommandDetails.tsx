import type { CommandDraft } from './types';

/** Name, purpose, notes and the machinery flag. */
export function CommandDetails({ draft, onChange, readOnly }: { draft: CommandDraft; onChange: (patch: Partial<CommandDraft>) => void; readOnly: boolean }) {
  return (
    <div className="grid gap-3 sm:grid-cols-2">
      <div>
        <label htmlFor="cmd-name" className="label">Command name</label>
        <input id="cmd-name" className="input" value={draft.name} readOnly={readOnly} aria-invalid={!draft.name.trim()} onChange={(e) => onChange({ name: e.target.value })} />
        {!draft.name.trim() && <p className="field-error">Enter a command name.</p>}
      </div>
      <div>
        <label htmlFor="cmd-purpose" className="label">Purpose</label>
        <input id="cmd-purpose" className="input" value={draft.purpose} readOnly={readOnly} onChange={(e) => onChange({ purpose: e.target.value })} />
      </div>
      <div className="sm:col-span-2">
        <label htmlFor="cmd-notes" className="label">Notes</label>
        <textarea id="cmd-notes" className="input" rows={2} value={draft.notes} readOnly={readOnly} onChange={(e) => onChange({ notes: e.target.value })} />
      </div>
      <label className="flex items-center gap-2 text-sm sm:col-span-2">
        <input type="checkbox" checked={draft.movesMachinery} disabled={readOnly} onChange={(e) => onChange({ movesMachinery: e.target.checked })} />
        This command moves machinery
      </label>
    </div>
  );
}
