import type { APIRoute } from 'astro';
import { z } from 'zod';
import {
  type ChecksumAlgorithm, crcParamsSchema, findChecksumAlgorithm, formatChecksumValue, isCustomCrcName, listChecksumAlgorithms, parseHex, placeChecksum, resolveChecksum, toHex,
} from '../../../lib/frame';
import { json, readJson, route, validate } from '../../../lib/server/http';
import { Invalid } from '../../../lib/server/errors';

const checksumSchema = z.object({ algorithm: z.string().min(1).max(64), crc: crcParamsSchema.optional(), bytes: z.string().max(60000) });

/**
 * Public: checksum of hex bytes by catalogue name or alias, or `custom` with CRC parameters in `crc`;
 * the value as sent in either byte order, and the order the model is presented in.
 */
export const POST: APIRoute = route(async ({ request }) => {
  const body = validate(checksumSchema, await readJson(request, 64 * 1024));
  const custom = isCustomCrcName(body.algorithm);
  if (custom && !body.crc) throw new Invalid('A custom CRC needs its parameters in "crc": width, poly, init, refin, refout, xorout.', { fields: { crc: 'Required with the algorithm "custom"' } });
  if (!custom && body.crc) throw new Invalid(`CRC parameters are given only with the algorithm "custom", not with "${body.algorithm}".`, { fields: { crc: 'Only with the algorithm "custom"' } });
  const algorithm: ChecksumAlgorithm | undefined = custom ? resolveChecksum(body) : findChecksumAlgorithm(body.algorithm);
  if (!algorithm) {
    throw new Invalid(`Unknown checksum algorithm "${body.algorithm}".`, { algorithms: listChecksumAlgorithms().map((a) => a.name) });
  }
  const parsed = parseHex(body.bytes);
  if (!parsed.ok) throw new Invalid(parsed.error.message, { position: parsed.error.position });
  const value = algorithm.compute(parsed.value);
  const place = (byteOrder: 'low-first' | 'high-first') => toHex(placeChecksum(value, algorithm.width, { encoding: 'binary', byteOrder, case: 'upper' }));
  return json({
    algorithm: algorithm.name,
    value: formatChecksumValue(value, algorithm.width),
    width: algorithm.width,
    byteOrder: algorithm.byteOrder,
    highByteFirst: place('high-first'),
    lowByteFirst: place('low-first'),
  });
});
