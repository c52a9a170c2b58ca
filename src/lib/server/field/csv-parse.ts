/** Parsing a large CSV text a slice at a time, so other requests get their turn between slices. */
import Papa from 'papaparse';
import { nextTurn } from '../jobs/turns';

export interface ParsedCsv {
  fields: string[];
  data: Record<string, string>[];
  /** `row` counts data rows from 0, as Papa does. */
  errors: { row?: number; message: string }[];
}

const OPTIONS = { header: true, skipEmptyLines: 'greedy' } as const;

/**
 * The same result as `Papa.parse(text, { header: true, skipEmptyLines: 'greedy' })`, parsed in slices of
 * about `size` characters. A slice ends at a line end outside any quoted field (a quote opens a field
 * only at its start, as Papa reads it), and each slice is parsed behind the header line with the
 * delimiter found in the first.
 */
export async function parseCsvInSlices(text: string, size = 32 * 1024): Promise<ParsedCsv> {
  const headerEnd = text.indexOf('\n') + 1;
  if (headerEnd === 0 || headerEnd >= text.length || text.length <= size) return whole(text);
  const header = text.slice(0, headerEnd);
  // A quoted header cell could hold a line end; such files are parsed whole.
  if (header.includes('"')) return whole(text);
  const out: ParsedCsv = { fields: [], data: [], errors: [] };
  let delimiter: string | undefined;
  for (let pos = headerEnd; pos < text.length; ) {
    const end = sliceEnd(text, pos, size, delimiter ?? guessDelimiter(header));
    const parsed = Papa.parse<Record<string, string>>(header + text.slice(pos, end), { ...OPTIONS, ...(delimiter ? { delimiter } : {}) });
    if (!delimiter) {
      delimiter = parsed.meta.delimiter;
      out.fields = parsed.meta.fields ?? [];
    }
    for (const e of parsed.errors) out.errors.push({ row: e.row === undefined ? undefined : e.row + out.data.length, message: e.message });
    for (const row of parsed.data) out.data.push(row);
    pos = end;
    if (pos < text.length) await nextTurn();
  }
  return out;
}

function whole(text: string): ParsedCsv {
  const parsed = Papa.parse<Record<string, string>>(text, OPTIONS);
  return { fields: parsed.meta.fields ?? [], data: parsed.data, errors: parsed.errors.map((e) => ({ row: e.row, message: e.message })) };
}

function guessDelimiter(header: string): string {
  return Papa.parse(header, { preview: 1 }).meta.delimiter;
}

/** Index just past the first line end at or after `from + size` that lies outside quotes (or the text's end). */
function sliceEnd(text: string, from: number, size: number, delimiter: string): number {
  const target = from + size;
  let quoted = false;
  let fieldStart = true;
  for (let i = from; i < text.length; i++) {
    const c = text[i];
    if (quoted) {
      if (c === '"') {
        if (text[i + 1] === '"') i++;
        else quoted = false;
      }
      continue;
    }
    if (c === '"' && fieldStart) {
      quoted = true;
      fieldStart = false;
    } else if (c === '\n') {
      if (i + 1 >= target) return i + 1;
      fieldStart = true;
    } else if (c === '\r' || text.startsWith(delimiter, i)) {
      fieldStart = true;
      i += c === '\r' ? 0 : delimiter.length - 1;
    } else {
      fieldStart = false;
    }
  }
  return text.length;
}
