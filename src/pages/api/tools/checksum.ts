import type { APIRoute } from 'astro';
import { z } from 'zod';
import { findChecksumAlgorithm, formatChecksumValue, listChecksumAlgorithms, parseHex, placeChecksum, toHex } from '../../../lib/frame';
import { HttpError, json, readJson, route, validate } from '../../../lib/server/http';

const checksumSchema = z.object({ algorithm: z.string().min(1).max(64), bytes: z.string().max(60000) });

/** Public: checksum of hex bytes by catalogue name or alias; also the value as sent in either byte order. */
export const POST: APIRoute = route(async ({ request }) => {
  const body = validate(checksumSchema, await readJson(request, 64 * 1024));
  const algorithm = findChecksumAlgorithm(body.algorithm);
  if (!algorithm) {
    throw new HttpError(422, `Unknown checksum algorithm "${body.algorithm}".`, { algorithms: listChecksumAlgorithms().map((a) => a.name) });
  }
  const parsed = parseHex(body.bytes);
  if (!parsed.ok) throw new HttpError(422, parsed.error.message, { position: parsed.error.position });
  const value = algorithm.compute(parsed.value);
  const place = (byteOrder: 'low-first' | 'high-first') => toHex(placeChecksum(value, algorithm.width, { encoding: 'binary', byteOrder, case: 'upper' }));
  return json({
    algorithm: algorithm.name,
    value: formatChecksumValue(value, algorithm.width),
    width: algorithm.width,
    highByteFirst: place('high-first'),
    lowByteFirst: place('low-first'),
  });
});
