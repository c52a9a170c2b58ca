/**
 * The part of a CSV import's check that depends on the file and the mapping alone: parsing, the mapping's
 * columns, the row limit, and each row read through the mapping. A preview keeps it for the apply that usually
 * follows with the same body, so the apply does not read every row again; what depends on the vault (the machine,
 * the tags already on it, duplicates within the file) is worked out afresh from it each time.
 */
import { CSV_FIELDS, readCsvRow, type CsvMapping, type SettingsChecks } from '../../field/csv';
import type { CsvImportRequest } from '../../schemas/field';
import { Invalid, TooLarge } from '../errors';
import { inSlices } from '../jobs/turns';
import type { Progress } from '../jobs/jobs';
import { parseCsvInSlices, type ParsedCsv } from './csv-parse';

export const CSV_MAX_ROWS = 50_000;
/** Rows read between turns for other requests. */
const CHECK_SLICE = 250;
/** A preview's reading is kept this long for its apply. */
export const CHECKED_KEPT_MS = 10 * 60_000;
/** At most this many rows are kept, over all previews of this process (the oldest go first). */
const CHECKED_MAX_ROWS = CSV_MAX_ROWS;
/** At most this many characters of the files read are kept with them (two of the largest files a request takes). */
const CHECKED_MAX_CHARS = 20 * 1024 * 1024;

export interface CheckedFile {
  /** Errors of the parser; `row` counts data rows from 0. */
  parseErrors: ParsedCsv['errors'];
  /** Each data row read through the mapping, in file order. */
  rows: ReturnType<typeof readCsvRow>[];
}

/** Parses the file, checks the mapping against its header, and reads every row (`progress` counts rows of twice the file). */
export async function checkFile(req: CsvImportRequest, progress?: Progress): Promise<CheckedFile> {
  const parsed = await parseCsvInSlices(req.csv);
  const headers = parsed.fields;
  const mapping = req.mapping as CsvMapping;
  const known = new Set<string>(CSV_FIELDS.map((f) => f.key));
  for (const [field, column] of Object.entries(mapping)) {
    if (!known.has(field)) throw new Invalid(`mapping.${field}: unknown field`, { fields: { [`mapping.${field}`]: 'Not a field of the import.' } });
    if (!headers.includes(column)) throw new Invalid(`mapping.${field}: the file has no column "${column}"`, { fields: { [`mapping.${field}`]: `No column "${column}" in the file.` } });
  }
  if (!mapping.tag) throw new Invalid('mapping.tag: choose the column with the device tag', { fields: { 'mapping.tag': 'Choose the column with the device tag.' } });
  if (parsed.data.length > CSV_MAX_ROWS) throw new TooLarge(`At most ${CSV_MAX_ROWS} rows per file; split the file.`);
  const checks: SettingsChecks = new Map();
  const rows: CheckedFile['rows'] = new Array(parsed.data.length);
  await inSlices(parsed.data, CHECK_SLICE, (raw, i) => {
    rows[i] = readCsvRow(raw, mapping, checks);
    if ((i + 1) % CHECK_SLICE === 0) void progress?.(i + 1, parsed.data.length * 2);
  });
  return { parseErrors: parsed.errors, rows };
}

/** Each kept reading with the text it read: it is reused only for that very text (compared whole, not hashed). */
const kept = new Map<string, { file: CheckedFile; csv: string; at: number }>();

/**
 * Whose file, which mapping, how long a text: one reading kept per key. Hashing the text instead cost tens of ms
 * of one stretch for a large file (other requests waited), twice per import; comparing it costs a memory compare.
 */
function keyOf(teamId: string, userId: string, req: CsvImportRequest): string {
  return `${teamId}\n${userId}\n${JSON.stringify(req.mapping)}\n${req.csv.length}`;
}

/** Keeps a preview's reading for the apply (replacing any older one of the same body). */
export function keepChecked(teamId: string, userId: string, req: CsvImportRequest, file: CheckedFile, now = Date.now()): void {
  dropExpired(now);
  if (file.rows.length > CHECKED_MAX_ROWS) return;
  const key = keyOf(teamId, userId, req);
  kept.delete(key);
  let rows = file.rows.length;
  let chars = req.csv.length;
  for (const v of kept.values()) {
    rows += v.file.rows.length;
    chars += v.csv.length;
  }
  for (const [k, v] of kept) {
    if (rows <= CHECKED_MAX_ROWS && chars <= CHECKED_MAX_CHARS) break;
    kept.delete(k);
    rows -= v.file.rows.length;
    chars -= v.csv.length;
  }
  kept.set(key, { file, csv: req.csv, at: now });
}

/** The reading a preview kept for this body, taken (each is used once), or undefined. */
export function takeChecked(teamId: string, userId: string, req: CsvImportRequest, now = Date.now()): CheckedFile | undefined {
  dropExpired(now);
  const key = keyOf(teamId, userId, req);
  const hit = kept.get(key);
  if (!hit || hit.csv !== req.csv) return undefined;
  kept.delete(key);
  return hit.file;
}

function dropExpired(now: number): void {
  for (const [k, v] of kept) if (now - v.at > CHECKED_KEPT_MS) kept.delete(k);
}
