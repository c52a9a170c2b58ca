/** Small parsers shared by the vault's API routes. */
import { z } from 'zod';
import { RECORD_TYPES } from '../../../db/schema';
import { validate } from '../http';
import { NotFound } from '../errors';

/** `?version=N` on DELETE: optional, but when sent it must be the current version. */
export function versionParam(url: URL): number | undefined {
  const raw = url.searchParams.get('version');
  if (raw === null) return undefined;
  return validate(z.strictObject({ version: z.coerce.number().int().positive('version is a positive whole number.') }), { version: raw }).version;
}

/** The `{type}` of a trash route: a vault record type or `command`; 404 for anything else. */
export function recordTypeParam(value: string | undefined) {
  const parsed = z.enum(RECORD_TYPES).safeParse(value);
  if (!parsed.success) throw new NotFound(`Unknown record type "${value}"; use one of ${RECORD_TYPES.join(', ')}.`);
  return parsed.data;
}

export const idFilter = z.string().min(1).max(64).optional();
