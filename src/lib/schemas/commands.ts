/** Request and form schemas for the command library, shared by the API routes and the composer islands. */
import { z } from 'zod';
import { readTypedNumber } from '../frame/field-format';
import { isField, templateSchema, type FieldSegment, type Template } from '../frame/template';
import { MAX_PRESETS, presetKey } from '../composer/presets';
import { MAX_REPLY_WAIT_MS, MAX_SEQUENCE_DELAY_MS, MAX_SEQUENCE_STEPS, SEQUENCE_MODES } from '../frame/sequence-limits';

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

/** One step of a saved sequence: a library command by id, or an inline template (exactly one of the two). */
export const savedStepSchema = z
  .strictObject({
    commandId: id.optional(),
    template: templateSchema.optional(),
    values: fieldValuesSchema.default({}),
    replyTemplate: templateSchema.nullable().optional(),
    waitForReplyMs: z.number().finite().min(0).max(MAX_REPLY_WAIT_MS).optional(),
  })
  .superRefine((s, ctx) => {
    if (!s.commandId === !s.template) ctx.addIssue({ code: 'custom', path: ['commandId'], message: 'Give a step either a library command (commandId) or its own template (one of them).' });
    if (s.commandId && s.replyTemplate !== undefined) ctx.addIssue({ code: 'custom', path: ['replyTemplate'], message: 'A library command\'s step expects that command\'s reply; give a reply template only to an inline step.' });
    if (s.template) for (const [key, message] of valuesProblems(s.template, s.values)) ctx.addIssue({ code: 'custom', path: ['values', key], message });
  });

/** A saved sequence: 1 to 32 steps sent as one string or separately, `delayMs` apart. */
export const savedSequenceSchema = z
  .strictObject({
    mode: z.enum(SEQUENCE_MODES).default('one-string'),
    delayMs: z.number().finite().min(0).max(MAX_SEQUENCE_DELAY_MS).default(0),
    steps: z.array(savedStepSchema).min(1, 'Give the sequence at least one step.').max(MAX_SEQUENCE_STEPS, `A sequence has at most ${MAX_SEQUENCE_STEPS} steps.`),
  })
  .superRefine((q, ctx) => {
    if (q.mode !== 'separate' && q.delayMs > 0) ctx.addIssue({ code: 'custom', path: ['delayMs'], message: 'A delay applies only between separate sends; choose separate sends or set the delay to 0.' });
    q.steps.forEach((s, i) => {
      if (s.waitForReplyMs !== undefined && q.mode !== 'separate') ctx.addIssue({ code: 'custom', path: ['steps', i, 'waitForReplyMs'], message: 'A step waits for its reply only when the steps are sent separately.' });
      if (s.waitForReplyMs !== undefined && s.template && !s.replyTemplate) ctx.addIssue({ code: 'custom', path: ['steps', i, 'waitForReplyMs'], message: 'Give the step a reply template to wait for, or leave the wait out.' });
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
  /** Set by an engineer: the command only reads, so the live link's framing search may send it dozens of times. */
  safeToRepeat: z.boolean().default(false),
  /** A setup command: it writes the device's settings and is offered after a framing search (docs/live-link.md). */
  setsUpDevice: z.boolean().default(false),
  /** Set for a sequence of commands (its own template is then unused: send `{ "version": 1, "segments": [] }`). */
  sequence: savedSequenceSchema.nullable().default(null),
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

/**
 * The live link's marks that cannot go together, each at its key: a command that moves machinery is never safe
 * to repeat, and a sequence takes neither mark (the live link repeats and sets up with single commands).
 */
export function marksProblems(c: { movesMachinery?: boolean; safeToRepeat?: boolean; setsUpDevice?: boolean; sequence?: unknown }): [key: string, message: string][] {
  const out: [string, string][] = [];
  if (c.safeToRepeat && c.movesMachinery) out.push(['safeToRepeat', 'A command that moves machinery is never safe to repeat; clear one of the two marks.']);
  if (c.sequence && c.safeToRepeat) out.push(['safeToRepeat', 'Mark a single command safe to repeat, not a sequence.']);
  if (c.sequence && c.setsUpDevice) out.push(['setsUpDevice', 'Mark the single commands that set the device up, not a sequence.']);
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
    for (const [key, message] of marksProblems(d)) ctx.addIssue({ code: 'custom', path: [key], message });
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
