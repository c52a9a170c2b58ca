/**
 * Framing search: one query, marked safe to repeat by an engineer, sent at candidate framings (common baud
 * rates × parity × stop bits, 8 data bits); a framing answered when the reply decodes against the reply template
 * with every checksum good and no framing or parity error. A command that moves machinery is never sent, whatever
 * its other marks.
 */
import { decodeReply } from '../frame/decode-reply';
import type { LineSettings, PortSettings } from '../frame/port-settings';
import { lineShorthand } from '../frame/port-text';
import type { Template } from '../frame/template';
import type { LiveLink } from './session';
import type { SerialPortLike } from './serial';

/** Baud rates tried, most common first in industrial serial work (common practice). */
export const SEARCH_BAUDS = [9600, 19200, 38400, 57600, 115200, 4800, 2400, 1200] as const;
export const SEARCH_PARITIES = ['none', 'even', 'odd'] as const;
export const SEARCH_STOP_BITS = [1, 2] as const;

/** Every candidate, the port's own framing first, each once. */
export function searchCandidates(own: LineSettings): LineSettings[] {
  const out: LineSettings[] = [{ baud: own.baud, dataBits: own.dataBits, parity: own.parity, stopBits: own.stopBits }];
  for (const baud of SEARCH_BAUDS) {
    for (const parity of SEARCH_PARITIES) {
      for (const stopBits of SEARCH_STOP_BITS) {
        if (!out.some((c) => c.baud === baud && c.parity === parity && c.stopBits === stopBits && c.dataBits === 8)) out.push({ baud, dataBits: 8, parity, stopBits });
      }
    }
  }
  return out;
}

export interface SearchCommand {
  name: string;
  movesMachinery: boolean;
  /** The engineer's mark: it only reads, so it may be sent once per candidate. */
  safeToRepeat: boolean;
  request: Uint8Array;
  replyTemplate: Template | null;
}

/** What the search's choice of query reads of a library command. */
export interface QueryCandidate {
  name: string;
  movesMachinery: boolean;
  safeToRepeat: boolean;
  replyTemplate: Template | null;
  /** Set for a sequence: never a query (the search sends one request at a time). */
  sequence?: unknown;
}

export type SearchOutcome = 'answered' | 'garbled' | 'silent' | 'not-opened';

export interface SearchResult {
  line: LineSettings;
  shorthand: string;
  outcome: SearchOutcome;
  detail: string;
}

/** Why this command may not be used for a search, or null. Moving machinery is checked first and overrides every mark. */
export function searchRefusal(c: QueryCandidate): string | null {
  if (c.movesMachinery) return `"${c.name}" moves machinery; a search sends its command dozens of times and never uses such a command.`;
  if (c.sequence) return `"${c.name}" is a sequence; a search repeats one single command.`;
  if (!c.safeToRepeat) return `"${c.name}" is not marked safe to repeat; an engineer marks a command that only reads as safe to repeat in its composer.`;
  if (!c.replyTemplate) return `"${c.name}" has no reply template, so an answer could not be recognised.`;
  return null;
}

/** The library's commands a search may offer as its query, in library order: marked safe to repeat, with a reply template, moving nothing. */
export function searchQueries<T extends QueryCandidate>(commands: readonly T[]): T[] {
  return commands.filter((c) => searchRefusal(c) === null);
}

export interface SearchDeps {
  port: SerialPortLike;
  settings: PortSettings;
  open: (port: SerialPortLike, settings: PortSettings) => Promise<LiveLink>;
  /** Called after each candidate; return false to stop. */
  progress?: (done: SearchResult[], total: number) => boolean | void;
}

/** Tries every candidate in turn (the port closed between them); throws without sending when the command is refused. */
export async function runFramingSearch(command: SearchCommand, deps: SearchDeps, candidates = searchCandidates(deps.settings)): Promise<SearchResult[]> {
  const refusal = searchRefusal(command);
  if (refusal) throw new Error(refusal);
  const results: SearchResult[] = [];
  for (const line of candidates) {
    const shorthand = lineShorthand(line);
    let link: LiveLink;
    try {
      link = await deps.open(deps.port, { ...deps.settings, ...line });
    } catch (e) {
      results.push({ line, shorthand, outcome: 'not-opened', detail: e instanceof Error ? e.message : String(e) });
      if (deps.progress?.(results, candidates.length) === false) break;
      continue;
    }
    try {
      const x = await link.exchange(command.request, `${command.name} at ${shorthand}`, command.replyTemplate);
      if (!x.reply.length) results.push({ line, shorthand, outcome: 'silent', detail: 'No reply within the response timeout.' });
      else {
        const decoded = decodeReply(command.replyTemplate!, x.reply);
        const good = decoded.ok && decoded.checksums.every((c) => c.ok) && !x.lineErrors.length;
        results.push({
          line, shorthand, outcome: good ? 'answered' : 'garbled',
          detail: good ? `A reply that decodes, checksum good (${x.reply.length} bytes).` : x.lineErrors.length ? `${x.reply.length} bytes with framing or parity errors.` : `${x.reply.length} bytes that do not decode.`,
        });
      }
    } finally {
      await link.close();
    }
    if (deps.progress?.(results, candidates.length) === false) break;
  }
  return results;
}
