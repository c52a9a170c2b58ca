import { useEffect, useRef } from 'react';
import type { CommandDraft } from './types';

type Typed = 'name' | 'purpose' | 'notes';

/**
 * Name, purpose, notes and the marks: moves machinery, and for a single command the live link's two (safe to
 * repeat in a framing search, setup command after one). A command that moves machinery cannot be safe to repeat.
 */
export function CommandDetails({ draft, onChange, readOnly, sequence = false }: { draft: CommandDraft; onChange: (patch: Partial<CommandDraft>) => void; readOnly: boolean; sequence?: boolean }) {
  // Text typed into the server-rendered fields before the island hydrated is in the page but not in the draft:
  // take it into the draft once, at mount, before a later render would put the draft's text back.
  const fields = useRef<Partial<Record<Typed, HTMLInputElement | HTMLTextAreaElement | null>>>({});
  useEffect(() => {
    if (readOnly) return;
    const typed: Partial<CommandDraft> = {};
    for (const k of ['name', 'purpose', 'notes'] as const) {
      const el = fields.current[k];
      if (el && el.value !== draft[k]) typed[k] = el.value;
    }
    if (Object.keys(typed).length) onChange(typed);
    // eslint-disable-next-line react-hooks/exhaustive-deps
  }, []);
  return (
    <div className="grid gap-3 sm:grid-cols-2">
      <div>
        <label htmlFor="cmd-name" className="label">Command name</label>
        <input id="cmd-name" ref={(el) => { fields.current.name = el; }} className="input" value={draft.name} readOnly={readOnly} aria-invalid={!draft.name.trim()} onChange={(e) => onChange({ name: e.target.value })} />
        {!draft.name.trim() && <p className="field-error">Enter a command name.</p>}
      </div>
      <div>
        <label htmlFor="cmd-purpose" className="label">Purpose</label>
        <input id="cmd-purpose" ref={(el) => { fields.current.purpose = el; }} className="input" value={draft.purpose} readOnly={readOnly} onChange={(e) => onChange({ purpose: e.target.value })} />
      </div>
      <div className="sm:col-span-2">
        <label htmlFor="cmd-notes" className="label">Notes</label>
        <textarea id="cmd-notes" ref={(el) => { fields.current.notes = el; }} className="input" rows={2} value={draft.notes} readOnly={readOnly} onChange={(e) => onChange({ notes: e.target.value })} />
      </div>
      <label className="flex items-center gap-2 text-sm sm:col-span-2">
        <input type="checkbox" checked={draft.movesMachinery} disabled={readOnly}
          onChange={(e) => onChange(e.target.checked ? { movesMachinery: true, ...(draft.safeToRepeat ? { safeToRepeat: false } : {}) } : { movesMachinery: false })} />
        This command moves machinery
      </label>
      {!sequence && (
        <>
          <div className="grid gap-0.5 text-sm sm:col-span-2">
            <label className="flex items-center gap-2">
              <input type="checkbox" checked={draft.safeToRepeat} disabled={readOnly || draft.movesMachinery} aria-describedby="cmd-safe-hint"
                onChange={(e) => onChange({ safeToRepeat: e.target.checked })} />
              Safe to repeat: it only reads
            </label>
            <p id="cmd-safe-hint" className="text-xs text-muted pl-6">
              {draft.movesMachinery ? 'A command that moves machinery is never safe to repeat.' : 'The live link\'s framing search may send it dozens of times, at every candidate framing.'}
            </p>
          </div>
          <div className="grid gap-0.5 text-sm sm:col-span-2">
            <label className="flex items-center gap-2">
              <input type="checkbox" checked={draft.setsUpDevice} disabled={readOnly} aria-describedby="cmd-setup-hint" onChange={(e) => onChange({ setsUpDevice: e.target.checked })} />
              Setup command: it writes the device's settings
            </label>
            <p id="cmd-setup-hint" className="text-xs text-muted pl-6">
              Offered after a framing search finds a replacement unit, to bring it to the stored settings; setup commands go in the library's order (by name).
            </p>
          </div>
        </>
      )}
    </div>
  );
}
