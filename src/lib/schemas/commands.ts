/** Request and form schemas for the command library, shared by the API routes and the composer islands. */
import { z } from 'zod';
import { readTypedNumber } from '../frame/field-format';
import { isField, templateSchema, type FieldSegment, type Template } from '../frame/template';
import { MAX_PRESETS, presetKey } from '../composer/presets';

const text = (max: number) => z.string().trim().max(max, `Use at most ${max} characters.`);
const id = z.string().min(1, 'Choose a record.').max(64);
export const versionSchema = z.number({ error: 'Send the version you edited.' }).int().positive();

/** A value as typed in the form (text) or sent by a script (number); null/'' = use the field default. */
const valueSchema = z.union([z.string().max(1024, 'At most 1024 characters.'), z.number().finite(), z.null()]);
export const fieldValuesSchema = z.record(z.string().max(64), valueSchema);

/** Problem with one value for `field`, or null when it is usable. Messages say what to enter. */
export function fieldValueProblem(field: FieldSegment, raw: unknown): string | null {
  const empty = raw === undefined || raw === null || raw === '';
  if (empty) return field.default === undefined ? `Enter ${field.label || field.name}.` : null;
  if (field.type === 'integer' || field.type === 'decimal') {
    const read = readTypedNumber(typeof raw === 'number' ? raw : String(raw));
    if (!read.ok) return read.kind === 'form' ? `${field.label || field.name}: ${read.reason}.` : `${field.label || field.name} must be a number.`;
    const unit = field.unit ? ` ${field.unit}` : '';
    if (field.min !== undefined && read.value.lt(field.min)) return `At least ${field.min}${unit}.`;
    if (field.max !== undefined && read.value.gt(field.max)) return `At most ${field.max}${unit}.`;
    return null;
  }
  const s = String(raw);
  if (field.type === 'choice') {
    return field.options.some((o) => o.value === s) ? null : `Choose one of ${field.options.map((o) => o.value).join(', ')}.`;
  }
  if (field.maxLength !== undefined && s.length > field.maxLength) return `At most ${field.maxLength} characters.`;
  const allowed = field.allowed;
  for (const ch of s) {
    const ok = allowed ? allowed.includes(ch) : ch >= ' ' && ch <= '~';
    if (!ok) return `"${ch}" is not allowed here${allowed ? `; use only ${allowed}` : '; use printable ASCII'}.`;
  }
  return null;
}

/**
 * The form schema for a template's field values (react-hook-form resolver and server check alike):
 * one key per field, each checked with `fieldValueProblem`.
 */
export function valuesSchemaFor(template: Template) {
  const fields = template.segments.filter(isField);
  return fieldValuesSchema.superRefine((values, ctx) => {
    for (const f of fields) {
      const problem = fieldValueProblem(f, values[f.name]);
      if (problem) ctx.addIssue({ code: 'custom', path: [f.name], message: problem });
    }
    for (const key of Object.keys(values)) {
      if (!fields.some((f) => f.name === key)) ctx.addIssue({ code: 'custom', path: [key], message: `The template has no field named "${key}".` });
    }
  });
}

const rawUnitsSchema = z.record(z.string().max(64), text(24)).refine((r) => Object.keys(r).length <= 64, 'At most 64 raw units.');

export const presetSchema = z.strictObject({
  name: text(60).min(1, 'Name the preset.'),
  values: fieldValuesSchema,
});
export const presetsSchema = z.array(presetSchema).max(MAX_PRESETS, `At most ${MAX_PRESETS} presets per command.`).superRefine((list, ctx) => {
  const seen = new Set<string>();
  list.forEach((p, i) => {
    if (seen.has(presetKey(p.name))) ctx.addIssue({ code: 'custom', path: [i, 'name'], message: `Another preset is already named "${p.name}".` });
    seen.add(presetKey(p.name));
  });
});

const commandFields = {
  name: text(120).min(1, 'Enter a command name.'),
  purpose: text(300).default(''),
  template: templateSchema,
  fieldValues: fieldValuesSchema.default({}),
  replyTemplate: templateSchema.nullable().default(null),
  portName: text(60).default(''),
  rawUnits: rawUnitsSchema.default({}),
  presets: presetsSchema.default([]),
  notes: text(5000).default(''),
  movesMachinery: z.boolean().default(false),
};

/** Problems of values (saved or a preset's) with the template, each at its key; empty when they fit. */
export function valuesProblems(template: Template, values: Record<string, unknown>): [key: string, message: string][] {
  const fields = template.segments.filter(isField);
  const out: [string, string][] = [];
  for (const [key, v] of Object.entries(values)) {
    const f = fields.find((x) => x.name === key);
    const problem = f ? (v === null || v === '' ? null : fieldValueProblem(f, v)) : `The template has no field named "${key}".`;
    if (problem) out.push([key, problem]);
  }
  return out;
}

/** Field values and every preset's values must fit the template they are saved with. */
function valuesFit(data: { template?: Template; fieldValues?: Record<string, unknown>; presets?: { name: string; values: Record<string, unknown> }[] }, ctx: z.RefinementCtx) {
  if (!data.template) return;
  for (const [key, message] of valuesProblems(data.template, data.fieldValues ?? {})) ctx.addIssue({ code: 'custom', path: ['fieldValues', key], message });
  (data.presets ?? []).forEach((p, i) => {
    for (const [key, message] of valuesProblems(data.template!, p.values)) ctx.addIssue({ code: 'custom', path: ['presets', i, 'values', key], message: `Preset "${p.name}": ${message}` });
  });
}

export const commandCreateSchema = z
  .strictObject({ deviceId: id.optional(), profileId: id.optional(), ...commandFields })
  .superRefine((d, ctx) => {
    if (!d.deviceId === !d.profileId) ctx.addIssue({ code: 'custom', path: ['deviceId'], message: 'Give either deviceId or profileId (one of them).' });
    valuesFit(d, ctx);
  });

const partialFields = Object.fromEntries(
  Object.entries(commandFields).map(([k, v]) => [k, (v instanceof z.ZodDefault ? (v.def.innerType as z.ZodType) : v).optional()]),
) as { [K in keyof typeof commandFields]: z.ZodOptional<z.ZodType<z.output<(typeof commandFields)[K]>, z.input<(typeof commandFields)[K]>>> };

export const commandUpdateSchema = z.strictObject({ version: versionSchema, ...partialFields }).superRefine(valuesFit);

export const commandCopySchema = z
  .strictObject({ deviceId: id.optional(), profileId: id.optional(), name: text(120).min(1, 'Enter a name.').optional() })
  .refine((d) => !d.deviceId !== !d.profileId, { path: ['deviceId'], message: 'Copy to either a device (deviceId) or a profile (profileId).' });

export const commandRestoreSchema = z.strictObject({ revisionId: id, version: versionSchema });

export const commandListSchema = z
  .strictObject({ deviceId: id.optional(), profileId: id.optional(), trashed: z.enum(['true', 'false']).default('false') })
  .refine((d) => !d.deviceId !== !d.profileId, { path: ['deviceId'], message: 'Filter by deviceId or profileId (one of them).' });

export type CommandCreate = z.infer<typeof commandCreateSchema>;
export type CommandUpdate = z.infer<typeof commandUpdateSchema>;
export type CommandCopy = z.infer<typeof commandCopySchema>;
