/** Zod building blocks shared by the template, frame-rules and port-settings schemas. */
import { z } from 'zod';
import { parseHex } from './notations/numeric';

/** Bytes stored as hex text in saved JSON (`"02"`, `"0D 0A"`); any separator accepted by `parseHex`. */
export const hexBytesSchema = z.string().max(4096).superRefine((text, ctx) => {
  const r = parseHex(text);
  if (!r.ok) ctx.addIssue({ code: 'custom', message: `${r.error.message} (character ${r.error.position})` });
});

/** Decodes text already validated by `hexBytesSchema`; invalid text gives no bytes. */
export function hexBytes(text: string | undefined): Uint8Array {
  if (!text) return new Uint8Array(0);
  const r = parseHex(text);
  return r.ok ? r.value : new Uint8Array(0);
}

/** Field values as a request carries them, keyed by field name: text (at most 1,024 characters), a number, or null. */
export const fieldValuesSchema = z.record(z.string(), z.union([z.string().max(1024), z.number(), z.null()]));
