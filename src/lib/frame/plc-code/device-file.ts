/** One Structured Text file with every command of a device: a POU per command and one per preset. */
import { type FieldValues, type Template, loadTemplate } from '../template';
import { PLC_CAUTION, generatePlcCode } from './generate';

export interface PlcFileCommand {
  name: string;
  template: Template;
  presets: { name: string; values: FieldValues }[];
}

const ascii = (text: string) => text.replace(/[^\x20-\x7e]/g, '?').replace(/\(\*|\*\)/g, '');

/**
 * The file's text: the caution once, then each command (every field an input) and each of its presets (the
 * preset's fields fixed). A command that cannot be generated is named with the reason in a comment.
 */
export function plcFileForCommands(title: string, commands: readonly PlcFileCommand[], prefix = ''): string {
  const parts = [...PLC_CAUTION.map((l) => `(* ${l} *)`), `(* Structured Text (IEC 61131-3) for ${ascii(title)}: ${commands.length} command${commands.length === 1 ? '' : 's'}. *)`, ''];
  const taken: string[] = [];
  for (const c of commands) {
    const loaded = loadTemplate(c.template);
    const variants = [{ name: c.name, fixed: undefined as FieldValues | undefined }, ...c.presets.map((p) => ({ name: `${c.name} ${p.name}`, fixed: p.values }))];
    for (const v of variants) {
      const r = loaded.ok
        ? generatePlcCode([{ template: loaded.value, ...(v.fixed ? { fixed: v.fixed } : {}) }], { name: v.name, prefix, caution: false, taken })
        : loaded;
      if (r.ok) {
        taken.push(r.value.name);
        parts.push(r.value.code);
      } else parts.push(`(* "${ascii(v.name)}" is not generated: ${ascii(r.error.message)} *)`, '');
    }
  }
  return parts.join('\n');
}
