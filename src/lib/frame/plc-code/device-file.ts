/**
 * Structured Text files: every command of a device (a POU per command, one per preset, and a sequence's POUs),
 * or of every device on a machine; and a sequence's code on its own.
 */
import { failure, success, type Result } from '../result';
import type { SequenceMode } from '../sequence-limits';
import { type FieldValues, type Template, loadTemplate } from '../template';
import { PLC_CAUTION, type PlcNote, type PlcStepInput, generatePlcCode } from './generate';

/** A sequence as the file needs it: its steps' templates and saved values, or why it cannot be generated. */
export type PlcFileSequence = { mode: SequenceMode; delayMs: number; steps: { template: Template; values: FieldValues }[] } | { gap: string };

export interface PlcFileCommand {
  name: string;
  template: Template;
  presets: { name: string; values: FieldValues }[];
  /** Present for a sequence (its own template is empty: the steps hold the templates). */
  sequence?: PlcFileSequence;
}

export interface PlcSequenceCode {
  /** The POU names, in the order they are written (one, or one per step for separate sends). */
  names: string[];
  code: string;
  findings: PlcNote[];
}

const ascii = (text: string) => text.replace(/[^\x20-\x7e]/g, '?').replace(/\(\*|\*\)/g, '');
const comment = (text: string) => `(* ${ascii(text)} *)`;

/**
 * A sequence's code. Sent as one string: one POU that builds every step back to back. Sent as separate sends:
 * one POU per step ("<name> step 1", …) for the PLC program to send in order, with the pause between them.
 * Steps given `fixed` values write those as constants; the other fields are inputs.
 */
export function plcCodeForSequence(name: string, seq: { mode: SequenceMode; delayMs: number; steps: readonly PlcStepInput[] },
  options: { prefix?: string; taken?: readonly string[]; caution?: boolean } = {}): Result<PlcSequenceCode> {
  if (seq.steps.length === 0) return failure(0, 'The sequence has no steps to generate');
  const caution = options.caution ?? true;
  if (seq.mode === 'one-string') {
    const r = generatePlcCode(seq.steps, { name, prefix: options.prefix, caution, taken: options.taken ?? [] });
    return r.ok ? success({ names: [r.value.name], code: r.value.code, findings: r.value.findings }) : r;
  }
  const names: string[] = [];
  const findings: PlcNote[] = [];
  const out = caution ? PLC_CAUTION.map((l) => `(* ${l} *)`) : [];
  out.push(comment(`"${name}" is sent as ${seq.steps.length} separate sends: send what each function below builds, in order, ${seq.delayMs ? `pausing ${seq.delayMs} ms between sends` : 'one after the other'}.`), '');
  for (const [i, step] of seq.steps.entries()) {
    const r = generatePlcCode([step], { name: `${name} step ${i + 1}`, prefix: options.prefix, caution: false, taken: [...(options.taken ?? []), ...names] });
    if (!r.ok) return failure(0, `Step ${i + 1}: ${r.error.message}`);
    names.push(r.value.name);
    findings.push(...r.value.findings.map((f) => ({ ...f, message: `Step ${i + 1}: ${f.message}` })));
    out.push(r.value.code);
  }
  return success({ names, code: out.join('\n'), findings });
}

/** A command's POUs for a file: every field an input, then each preset (or, for a sequence, its saved values fixed). */
function commandParts(c: PlcFileCommand, prefix: string, taken: string[]): string[] {
  const parts: string[] = [];
  if (c.sequence) {
    if ('gap' in c.sequence) return [comment(`"${c.name}" is not generated: ${c.sequence.gap}`), ''];
    const seq = c.sequence;
    const variants = [
      { name: c.name, steps: seq.steps.map((s) => ({ template: s.template })) },
      { name: `${c.name} as saved`, steps: seq.steps.map((s) => ({ template: s.template, fixed: s.values })) },
    ];
    for (const v of variants) {
      const r = plcCodeForSequence(v.name, { mode: seq.mode, delayMs: seq.delayMs, steps: v.steps }, { prefix, caution: false, taken });
      if (r.ok) { taken.push(...r.value.names); parts.push(r.value.code); } else parts.push(comment(`"${v.name}" is not generated: ${r.error.message}`), '');
    }
    return parts;
  }
  const loaded = loadTemplate(c.template);
  const variants = [{ name: c.name, fixed: undefined as FieldValues | undefined }, ...c.presets.map((p) => ({ name: `${c.name} ${p.name}`, fixed: p.values }))];
  for (const v of variants) {
    const r = loaded.ok
      ? generatePlcCode([{ template: loaded.value, ...(v.fixed ? { fixed: v.fixed } : {}) }], { name: v.name, prefix, caution: false, taken })
      : loaded;
    if (r.ok) {
      taken.push(r.value.name);
      parts.push(r.value.code);
    } else parts.push(comment(`"${v.name}" is not generated: ${r.error.message}`), '');
  }
  return parts;
}

/** A tag as the start of an identifier: `DRV-501` → `DRV_501` (a tag's dash is a separator, not a minus). */
const tagIdentifier = (tag: string) => {
  const id = tag.split(/[^A-Za-z0-9]+/).filter(Boolean).join('_');
  return !id ? 'Dev' : /^\d/.test(id) ? `Dev_${id}` : id;
};

const countOf = (n: number) => `${n} command${n === 1 ? '' : 's'}`;

/**
 * The file's text: the caution once, then each command (every field an input), each of its presets (the
 * preset's fields fixed) and each sequence (every field an input, then its steps' saved values fixed). A
 * command that cannot be generated is named with the reason in a comment.
 */
export function plcFileForCommands(title: string, commands: readonly PlcFileCommand[], prefix = ''): string {
  const parts = [...PLC_CAUTION.map((l) => `(* ${l} *)`), comment(`Structured Text (IEC 61131-3) for ${title}: ${countOf(commands.length)}.`), ''];
  const taken: string[] = [];
  for (const c of commands) parts.push(...commandParts(c, prefix, taken));
  return parts.join('\n');
}

/**
 * Every device of a machine in one file: each device's POUs start with its tag (after the caller's prefix),
 * so two devices' commands of the same name stay apart (`DRV_501_Index_45`, `DRV_502_Index_45`).
 */
export function plcFileForDevices(title: string, devices: readonly { tag: string; commands: readonly PlcFileCommand[] }[], prefix = ''): string {
  const total = devices.reduce((n, d) => n + d.commands.length, 0);
  const parts = [...PLC_CAUTION.map((l) => `(* ${l} *)`), comment(`Structured Text (IEC 61131-3) for ${title}: ${devices.length} device${devices.length === 1 ? '' : 's'}, ${countOf(total)}.`), ''];
  const taken: string[] = [];
  for (const d of devices) {
    parts.push(comment(`${d.tag}: ${countOf(d.commands.length)}`), '');
    const own = `${prefix}${prefix && !prefix.endsWith('_') ? '_' : ''}${tagIdentifier(d.tag)}_`;
    for (const c of d.commands) parts.push(...commandParts(c, own, taken));
  }
  return parts.join('\n');
}
