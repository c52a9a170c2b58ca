/**
 * Setting up a replacement found by the framing search: the library's setup commands sent in order at the framing
 * that answered, then the link reopened at the stored framing and the search's query sent once to verify. The
 * caller confirms first (with the machinery caution); this module sends only what it is given, never a command
 * that is not marked as a setup command, and verifies only with a query the search itself would accept.
 */
import { decodeReply } from '../frame/decode-reply';
import type { LineSettings } from '../frame/port-settings';
import { lineShorthand } from '../frame/port-text';
import { isField, type FieldValues, type Template } from '../frame/template';
import { runFramingSearch, searchRefusal, type SearchCommand, type SearchDeps, type SearchResult } from './framing-search';
import type { LiveLink } from './session';

/** Fields of a setup command that take the stored port's line settings, by name. */
export const LINE_FIELD_NAMES = ['baud', 'dataBits', 'parity', 'stopBits'] as const;

/**
 * The values a setup command is sent with: its saved ones, with any field named `baud`, `dataBits`, `parity` or
 * `stopBits` set from the stored framing (a choice only when it offers that value), so the unit is set to what the
 * vault says rather than to what the command was saved with.
 */
export function setupValues(template: Template, saved: FieldValues, line: LineSettings): FieldValues {
  const out: FieldValues = { ...saved };
  for (const f of template.segments.filter(isField)) {
    if (!(LINE_FIELD_NAMES as readonly string[]).includes(f.name)) continue;
    const v = line[f.name as keyof LineSettings];
    if (f.type === 'choice') {
      if (f.options.some((o) => o.value === String(v))) out[f.name] = String(v);
    } else if (f.type === 'text') out[f.name] = String(v);
    else out[f.name] = v;
  }
  return out;
}

export interface SetupCommand {
  name: string;
  setsUpDevice: boolean;
  movesMachinery: boolean;
  request: Uint8Array;
  replyTemplate: Template | null;
}

/** `acknowledged`: a reply that decodes with good checksums; `sent`: no reply template, so nothing to check. */
export type SetupOutcome = 'acknowledged' | 'sent' | 'no-reply' | 'bad-reply' | 'not-sent';

export interface SetupStepResult {
  name: string;
  outcome: SetupOutcome;
  detail: string;
}

export interface SetupResult {
  /** Where the setup commands went. */
  at: string;
  steps: SetupStepResult[];
  /** The query sent once at the stored framing after the setup commands. */
  verify: SearchResult;
}

/** Why these setup commands cannot be sent, or null. */
export function setupRefusal(steps: readonly SetupCommand[]): string | null {
  if (!steps.length) return 'This device\'s library has no setup commands.';
  const unmarked = steps.find((s) => !s.setsUpDevice);
  if (unmarked) return `"${unmarked.name}" is not marked as a setup command.`;
  return null;
}

/**
 * Opens the port at `found`, sends every setup command in order and stops at the first that has a reply template
 * and gets no reply or one that does not decode (the rest are not sent); closes, then sends `query` once at the
 * stored settings. Throws without opening the port when the steps or the query are refused.
 */
export async function runSetup(steps: readonly SetupCommand[], query: SearchCommand, found: LineSettings, deps: Omit<SearchDeps, 'progress'>): Promise<SetupResult> {
  const refusal = setupRefusal(steps) ?? searchRefusal(query);
  if (refusal) throw new Error(refusal);
  const at = lineShorthand(found);
  const results: SetupStepResult[] = [];
  const link: LiveLink = await deps.open(deps.port, { ...deps.settings, ...found });
  try {
    let stopped = false;
    for (const s of steps) {
      if (stopped) {
        results.push({ name: s.name, outcome: 'not-sent', detail: 'Not sent: an earlier setup command was not acknowledged.' });
        continue;
      }
      const x = await link.exchange(s.request, `Setup: ${s.name} at ${at}`, s.replyTemplate);
      if (!s.replyTemplate) {
        results.push({ name: s.name, outcome: 'sent', detail: x.reply.length ? `Sent; ${x.reply.length} bytes came back (no reply template to check them).` : 'Sent; no reply is expected.' });
        continue;
      }
      if (!x.reply.length) {
        results.push({ name: s.name, outcome: 'no-reply', detail: 'No reply within the response timeout.' });
        stopped = true;
        continue;
      }
      const decoded = decodeReply(s.replyTemplate, x.reply);
      const good = decoded.ok && decoded.checksums.every((c) => c.ok) && !x.lineErrors.length;
      results.push({ name: s.name, outcome: good ? 'acknowledged' : 'bad-reply', detail: good ? 'A reply that decodes, checksum good.' : `${x.reply.length} bytes that do not decode${x.lineErrors.length ? ', with framing or parity errors' : ''}.` });
      if (!good) stopped = true;
    }
  } finally {
    await link.close();
  }
  const stored: LineSettings = { baud: deps.settings.baud, dataBits: deps.settings.dataBits, parity: deps.settings.parity, stopBits: deps.settings.stopBits };
  const [verify] = await runFramingSearch(query, deps, [stored]);
  return { at, steps: results, verify: verify! };
}

/** The setup commands of a library, in its order: marked as setup, single commands (a sequence is never sent here). */
export function setupCommands<T extends { setsUpDevice: boolean; sequence?: unknown }>(commands: readonly T[]): T[] {
  return commands.filter((c) => c.setsUpDevice && !c.sequence);
}
