/** Field values for the preview: react-hook-form with the shared schema, each numeric field shown in both units. */
import { useEffect, useMemo } from 'react';
import { useForm } from 'react-hook-form';
import { isField, type FieldSegment, type Template } from '../../lib/frame/template';
import type { FieldValues } from '../../lib/frame/template';
import { valuesSchemaFor } from '../../lib/schemas/commands';
import { bothUnits } from '../../lib/composer/scaling';
import { zodResolver } from '@hookform/resolvers/zod';

/** As the shared schema reads them; the inputs give text. */
type Values = Record<string, string | number | null>;

interface Props {
  template: Template;
  values: FieldValues;
  rawUnits: Record<string, string>;
  onChange: (v: FieldValues) => void;
  /** Prefix of the inputs' ids (several forms on one page each need their own); default `value`. */
  idPrefix?: string;
}

const asText = (v: unknown) => (v === undefined || v === null ? '' : String(v));

export function ValuesForm({ template, values, rawUnits, onChange, idPrefix = 'value' }: Props) {
  const fields = template.segments.filter(isField);
  // `raw`: the form keeps the text as typed (the engine reads numbers from the text, exactly).
  const resolver = useMemo(() => zodResolver(valuesSchemaFor(template), undefined, { raw: true }), [template]);
  const form = useForm<Values>({
    resolver,
    mode: 'onChange',
    defaultValues: Object.fromEntries(fields.map((f) => [f.name, asText(values[f.name])])),
  });
  useEffect(() => {
    form.trigger();
    const sub = form.watch((v) => onChange({ ...(v as Values) }));
    return () => sub.unsubscribe();
    // eslint-disable-next-line react-hooks/exhaustive-deps
  }, [form]);
  const live = form.watch();
  const errors = form.formState.errors;
  if (fields.length === 0) return <p className="text-sm text-muted">This command has no fields; add one to give it values.</p>;
  return (
    <form className="grid gap-3 sm:grid-cols-2" noValidate onSubmit={(e) => e.preventDefault()} data-testid="values-form">
      {fields.map((f: FieldSegment) => {
        const id = `${idPrefix}-${f.name}`;
        const err = errors[f.name]?.message;
        const both = f.type === 'integer' || f.type === 'decimal' ? bothUnits(f, live[f.name] || f.default, rawUnits[f.name]) : null;
        return (
          <div key={f.id}>
            <label htmlFor={id} className="label">{f.label || f.name}{'unit' in f && f.unit ? ` (${f.unit})` : ''}</label>
            {f.type === 'choice' ? (
              <select id={id} className="input" {...form.register(f.name)}>
                <option value="">Default ({f.default ?? 'none'})</option>
                {f.options.map((o) => <option key={o.value} value={o.value}>{o.label || o.value} → {o.send}</option>)}
              </select>
            ) : (
              <input id={id} className="input mono" inputMode={f.type === 'text' ? 'text' : 'decimal'} aria-invalid={!!err}
                placeholder={f.default !== undefined ? `default ${f.default}` : ''} {...form.register(f.name)} />
            )}
            {both && !err && <p className="text-xs text-muted mt-1" data-testid={`both-${f.name}`}>{both}</p>}
            {err && <p className="field-error" role="alert">{err}</p>}
          </div>
        );
      })}
    </form>
  );
}
