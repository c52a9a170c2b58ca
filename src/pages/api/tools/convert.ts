import type { APIRoute } from 'astro';
import { z } from 'zod';
import { NOTATIONS, parseNotation, renderAllNotations, toHex } from '../../../lib/frame';
import { json, readJson, route, validate } from '../../../lib/server/http';
import { Invalid } from '../../../lib/server/errors';

const convertSchema = z.object({ from: z.enum(NOTATIONS), text: z.string().max(32768) });

/** Public: text in one notation → the bytes in every notation. Malformed text answers 422 with the position. */
export const POST: APIRoute = route(async ({ request }) => {
  const { from, text } = validate(convertSchema, await readJson(request, 64 * 1024));
  const parsed = parseNotation(from, text);
  if (!parsed.ok) throw new Invalid(parsed.error.message, { position: parsed.error.position });
  const bytes = parsed.value;
  return json({ bytes: toHex(bytes), byteCount: bytes.length, notations: renderAllNotations(bytes) });
});
