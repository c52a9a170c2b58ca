/**
 * Value presets of a command: named value sets kept with it ("index one station", "jog 1° one way"), each shown
 * as the PLC string, hex and time on the wire it sends. Saved with the command (the Save section).
 */
import { useMemo, useState } from 'react';
import { MAX_PRESETS, presetKey, presetValues, renderCommand, type CommandPreset } from '../../lib/composer/presets';
import { ms } from '../../lib/composer/format';
import type { FieldValues, LineSettings, Template } from '../../lib/frame';
import { CopyButton } from '../ui/CopyButton';

interface Props {
  template: Template;
  values: FieldValues;
  presets: CommandPreset[];
  /** The port's line, for the time on the wire; null on a TCP port. */
  line: LineSettings | null;
  readOnly: boolean;
  onChange: (presets: CommandPreset[]) => void;
  /** Puts a preset's values into the form. */
  onUse: (values: FieldValues) => void;
}

/** The values of `values` a preset keeps: every field of the template that has one. */
function kept(values: FieldValues): FieldValues {
  return Object.fromEntries(Object.entries(values).filter(([, v]) => v !== undefined && v !== null && v !== ''));
}

const describe = (values: FieldValues) => Object.entries(values).map(([k, v]) => `${k} ${v}`).join(', ') || 'the saved values';

export function PresetsPanel({ template, values, presets, line, readOnly, onChange, onUse }: Props) {
  const [name, setName] = useState('');
  const rendered = useMemo(() => presets.map((p) => renderCommand(template, presetValues(values, p), line, p.name)), [presets, template, values, line]);
  const trimmed = name.trim();
  const clash = presets.some((p) => presetKey(p.name) === presetKey(trimmed));
  const problem = !trimmed ? null : trimmed.length > 60 ? 'Use at most 60 characters.' : clash ? `A preset is already named "${trimmed}".` : null;
  const full = presets.length >= MAX_PRESETS;
  const add = () => {
    if (!trimmed || problem || full) return;
    onChange([...presets, { name: trimmed, values: kept(values) }]);
    setName('');
  };
  return (
    <div className="grid gap-3" data-testid="presets">
      {presets.length === 0 ? (
        <p className="text-sm text-muted">No presets yet. A preset keeps a set of values under a name (for example one index, or a jog each way), so the library and the field card show what each sends.</p>
      ) : (
        <ul className="grid gap-2">
          {presets.map((p, i) => {
            const r = rendered[i]!;
            return (
              <li key={`${p.name}-${i}`} className="card p-3 grid gap-1" data-testid="preset">
                <div className="flex flex-wrap items-center gap-2">
                  <b className="mr-auto">{p.name}</b>
                  <button type="button" className="btn btn-quiet btn-sm" onClick={() => onUse(presetValues(values, p))}>Put in the form</button>
                  {!readOnly && (
                    <button type="button" className="btn btn-quiet btn-sm !text-bad" onClick={() => onChange(presets.filter((_, k) => k !== i))}
                      aria-label={`Remove preset ${p.name}`}>Remove</button>
                  )}
                </div>
                <p className="text-xs text-muted">Sets {describe(p.values)}</p>
                {r.problem ? (
                  <p className="notice notice-warn text-sm" role="alert">This preset cannot be built: {r.problem}</p>
                ) : (
                  <>
                    <div className="flex flex-wrap items-center gap-2"><code className="mono break-all text-sm">{r.plc}</code><CopyButton text={r.plc} what={`${p.name} PLC string`} /></div>
                    <div className="flex flex-wrap items-center gap-2"><code className="mono break-all text-xs">{r.hex}</code><CopyButton text={r.hex} what={`${p.name} hex`} /></div>
                    <p className="text-xs">{r.byteCount} bytes{r.wireMs !== null && ` · ${ms(r.wireMs)} on the wire`}</p>
                  </>
                )}
              </li>
            );
          })}
        </ul>
      )}
      {!readOnly && (
        <form className="flex flex-wrap items-end gap-2" onSubmit={(e) => { e.preventDefault(); add(); }}>
          <label className="grid gap-1 text-sm">
            <span>Keep the values in the form as a preset named</span>
            <input className="input" value={name} maxLength={80} onChange={(e) => setName(e.target.value)} placeholder="Jog 1° one way"
              aria-invalid={problem ? true : undefined} aria-describedby={problem ? 'preset-name-problem' : undefined} disabled={full} />
          </label>
          <button type="submit" className="btn btn-sm" disabled={!trimmed || !!problem || full}>Add preset</button>
          {problem && <p id="preset-name-problem" className="field-error w-full" role="alert">{problem}</p>}
          {full && <p className="text-sm text-muted w-full">At most {MAX_PRESETS} presets per command.</p>}
          <p className="text-xs text-muted w-full">Presets are saved with the command: use Save below.</p>
        </form>
      )}
    </div>
  );
}
