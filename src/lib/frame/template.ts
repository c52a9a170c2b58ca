/**
 * Command templates: an ordered list of segments (literal bytes, typed fields, checksums, a terminator).
 * Saved JSON form: `{ "version": 1, "segments": [...] }`; bytes inside it are hex text.
 */
import { z } from 'zod';
import { type ByteOrder, crcParamsSchema, defaultChecksumByteOrder, isCustomCrcName, resolveChecksum } from './checksum';
import { type Result, failure, success } from './result';
import { hexBytesSchema } from './schema-common';

export const TEMPLATE_VERSION = 1;

const idSchema = z.string().min(1).max(64);
const nameSchema = z.string().regex(/^[A-Za-z_][A-Za-z0-9_.-]{0,63}$/, 'Use letters, digits, _ . - and start with a letter');

/**
 * raw = round(value × factor ÷ divisor + offset) in exact decimal arithmetic, rounding half away from
 * zero. `divisor` keeps ratios such as 1000 steps per 360° exact (factor 1000, divisor 360).
 */
export const scaleSchema = z.object({
  factor: z.number().finite().refine((f) => f !== 0, 'factor must not be 0'),
  divisor: z.number().finite().positive().optional(),
  offset: z.number().finite().default(0),
});
export type Scale = z.infer<typeof scaleSchema>;

const fieldBase = {
  id: idSchema,
  /** Key in the values object. */
  name: nameSchema,
  label: z.string().max(120),
  /** Engineering unit shown beside the value, e.g. `°` or `mm`. */
  unit: z.string().max(24).optional(),
  scale: scaleSchema.optional(),
};

const numericBase = {
  ...fieldBase,
  default: z.number().finite().optional(),
  /** Characters the number occupies, sign included; none = as many as needed. */
  width: z.number().int().min(1).max(32).optional(),
  pad: z.enum(['zero', 'space']).default('zero'),
  /** `always`: `+45` / `-45`; `negative`: `45` / `-45`. */
  sign: z.enum(['always', 'negative']).default('negative'),
  /** Limits on the engineering value (before scaling). */
  min: z.number().finite().optional(),
  max: z.number().finite().optional(),
};

export const literalSegmentSchema = z.object({ type: z.literal('literal'), id: idSchema, bytes: hexBytesSchema, label: z.string().max(120).optional() });
export const terminatorSegmentSchema = z.object({ type: z.literal('terminator'), id: idSchema, bytes: hexBytesSchema });
export const integerFieldSchema = z.object({ type: z.literal('integer'), ...numericBase });
export const decimalFieldSchema = z.object({ type: z.literal('decimal'), ...numericBase, decimals: z.number().int().min(0).max(9) });
export const textFieldSchema = z.object({
  type: z.literal('text'),
  ...fieldBase,
  default: z.string().max(1024).optional(),
  maxLength: z.number().int().min(0).max(1024).optional(),
  /** Characters allowed in the value; none = printable ASCII. */
  allowed: z.string().max(256).optional(),
  case: z.enum(['upper', 'lower', 'as-is']).default('as-is'),
});
export const choiceFieldSchema = z.object({
  type: z.literal('choice'),
  ...fieldBase,
  default: z.string().optional(),
  /** `value` is the key given in values; `send` is the text put on the wire. */
  options: z
    .array(z.object({ value: z.string().min(1).max(64), label: z.string().max(120).optional(), send: z.string().max(256) }))
    .min(1)
    .max(256),
});
export const checksumSegmentSchema = z.object({
  type: z.literal('checksum'),
  id: idSchema,
  /** A catalogue name or alias (ASCII), or `custom` with the CRC parameters in `crc`. */
  algorithm: z.string().max(64),
  /** Own CRC parameters (width 1-32, poly, init, refin, refout, xorout), only with `algorithm: "custom"`. */
  crc: crcParamsSchema.optional(),
  /** Covered bytes: from the start of segment `from` (or the frame start) to the end of segment `to` (or up to this checksum). */
  range: z
    .object({ from: z.union([z.literal('start'), z.number().int().min(0)]), to: z.union([z.literal('checksum'), z.number().int().min(0)]) })
    .default({ from: 'start', to: 'checksum' }),
  /** `bytes`: the covered bytes as sent; `decoded-hex`: the bytes their hex characters stand for (Modbus ASCII LRC). */
  over: z.enum(['bytes', 'decoded-hex']).default('bytes'),
  encoding: z.enum(['binary', 'ascii-hex', 'ascii-decimal']).default('binary'),
  /** None given: the model's order for binary (low byte first for reflected CRCs such as CRC-16/MODBUS), else high byte first. */
  byteOrder: z.enum(['low-first', 'high-first']).optional(),
  case: z.enum(['upper', 'lower']).default('upper'),
});

export const segmentSchema = z.discriminatedUnion('type', [
  literalSegmentSchema, terminatorSegmentSchema, integerFieldSchema, decimalFieldSchema, textFieldSchema, choiceFieldSchema, checksumSegmentSchema,
]);

export const templateSchema = z
  .object({
    version: z.literal(TEMPLATE_VERSION),
    name: z.string().max(120).optional(),
    segments: z.array(segmentSchema).max(256),
  })
  .superRefine((t, ctx) => {
    const ids = new Set<string>();
    const names = new Set<string>();
    let terminators = 0;
    t.segments.forEach((s, i) => {
      const at = (msg: string, ...path: (string | number)[]) => ctx.addIssue({ code: 'custom', path: ['segments', i, ...path], message: msg });
      if (ids.has(s.id)) at(`Segment id "${s.id}" is used twice`, 'id');
      ids.add(s.id);
      if ('name' in s) {
        if (names.has(s.name)) at(`Field name "${s.name}" is used twice`, 'name');
        names.add(s.name);
      }
      if ((s.type === 'integer' || s.type === 'decimal') && s.min !== undefined && s.max !== undefined && s.min > s.max) at('min must not be above max', 'min');
      if (s.type === 'terminator' && ++terminators > 1) at('A template has at most one terminator');
      if (s.type === 'checksum') {
        if (isCustomCrcName(s.algorithm)) {
          if (!s.crc) at('A custom CRC needs its parameters: width, poly, init, refin, refout, xorout', 'crc');
        } else if (s.crc) at(`CRC parameters are given only with the algorithm "custom", not with "${s.algorithm}"`, 'crc');
        else if (!resolveChecksum(s)) at('Unknown checksum algorithm', 'algorithm');
        const from = s.range.from === 'start' ? 0 : s.range.from;
        const to = s.range.to === 'checksum' ? i - 1 : s.range.to;
        if (from >= i || to >= i) at('A checksum can only cover segments before it', 'range');
        else if (from > to) at('The checksum range starts after it ends', 'range');
      }
    });
  })
  .transform((t) => ({
    ...t,
    segments: t.segments.map((s) => (s.type === 'checksum' && s.byteOrder === undefined ? { ...s, byteOrder: defaultChecksumByteOrder(s) } : s)) as Segment[],
  }));

type ParsedSegment = z.output<typeof segmentSchema>;
/** A checksum segment after parsing: the byte order is always filled in. */
export type ChecksumSegment = Omit<z.output<typeof checksumSegmentSchema>, 'byteOrder'> & { byteOrder: ByteOrder };
export type Segment = Exclude<ParsedSegment, { type: 'checksum' }> | ChecksumSegment;
export type Template = z.output<typeof templateSchema>;
export type TemplateInput = z.input<typeof templateSchema>;
export type SegmentType = Segment['type'];
export type IntegerField = z.infer<typeof integerFieldSchema>;
export type DecimalField = z.infer<typeof decimalFieldSchema>;
export type TextField = z.infer<typeof textFieldSchema>;
export type ChoiceField = z.infer<typeof choiceFieldSchema>;
export type FieldSegment = IntegerField | DecimalField | TextField | ChoiceField;

export function isField(s: Segment): s is FieldSegment {
  return s.type === 'integer' || s.type === 'decimal' || s.type === 'text' || s.type === 'choice';
}

/** Values keyed by field name; numeric fields also take numeric strings as typed in a form. */
export type FieldValues = Record<string, string | number | undefined | null>;

/** Validates any JSON value (or JSON text) as a template; errors name the path of the first problem. */
export function loadTemplate(input: unknown): Result<Template> {
  let data = input;
  if (typeof input === 'string') {
    try {
      data = JSON.parse(input);
    } catch {
      return failure(0, 'The template is not valid JSON');
    }
  }
  const r = templateSchema.safeParse(data);
  if (r.success) return success(r.data);
  const issue = r.error.issues[0]!;
  return failure(0, `${issue.path.join('.') || 'template'}: ${issue.message}`);
}

/** Canonical JSON for saving and export: keys in schema order, defaults filled in. */
export function serializeTemplate(t: TemplateInput): Result<string> {
  const r = templateSchema.safeParse(t);
  if (!r.success) return failure(0, `Cannot save an invalid template: ${r.error.issues[0]?.message ?? 'invalid'}`);
  return success(JSON.stringify(r.data, null, 2));
}

/**
 * Moves a segment from index `from` to index `to` and renumbers checksum ranges so they still cover
 * the same segments. An index outside the template is an error (position 0).
 */
export function moveSegment(t: Template, from: number, to: number): Result<Template> {
  const n = t.segments.length;
  for (const [what, i] of [['from', from], ['to', to]] as const) {
    if (!Number.isInteger(i) || i < 0 || i >= n) return failure(0, `Cannot move ${what} position ${i}: the template has segments 0 to ${n - 1}`);
  }
  const order = t.segments.map((_, i) => i);
  const [moved] = order.splice(from, 1);
  order.splice(to, 0, moved!);
  const newIndex = new Map(order.map((old, i) => [old, i]));
  const segments = order.map((old) => {
    const s = t.segments[old]!;
    if (s.type !== 'checksum') return s;
    const range = {
      from: s.range.from === 'start' ? s.range.from : newIndex.get(s.range.from) ?? s.range.from,
      to: s.range.to === 'checksum' ? s.range.to : newIndex.get(s.range.to) ?? s.range.to,
    } as ChecksumSegment['range'];
    return { ...s, range };
  });
  return success({ ...t, segments });
}
