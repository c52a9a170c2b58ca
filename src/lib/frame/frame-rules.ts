/** Per-dialect frame rules, stored with a device's port settings and applied by `checkFrame`. */
import { z } from 'zod';
import { hexBytesSchema } from './schema-common';

/**
 * `printable`: 0x20-0x7E inside the payload; `7-bit`: 0x00-0x7F; `8-bit`: any byte.
 * The start bytes and the terminator are outside the payload and exempt.
 */
export const BYTE_SETS = ['printable', '7-bit', '8-bit'] as const;
export type ByteSet = (typeof BYTE_SETS)[number];

export const frameRulesSchema = z.object({
  /** Bytes every frame begins with, as hex (e.g. `"02"` for STX). */
  start: hexBytesSchema.optional(),
  /** Bytes that end a frame, as hex (e.g. `"0D"`). */
  terminator: hexBytesSchema.optional(),
  /** Longest frame the device accepts, in bytes, start and terminator included. */
  maxLength: z.number().int().positive().max(65536).optional(),
  byteSet: z.enum(BYTE_SETS).default('8-bit'),
  /** Letters the device accepts: `upper`, `lower`, or `any`. */
  letterCase: z.enum(['upper', 'lower', 'any']).default('any'),
  /** Bytes that must not appear between start and terminator, as hex. */
  forbidden: hexBytesSchema.optional(),
  /** Valid device addresses, checked on the field named `addressField` (default `address`). */
  addressRange: z
    .object({ min: z.number().int(), max: z.number().int() })
    .refine((r) => r.min <= r.max, { message: 'min must not be above max' })
    .optional(),
  addressField: z.string().min(1).max(64).default('address'),
});

export type FrameRules = z.infer<typeof frameRulesSchema>;
export type FrameRulesInput = z.input<typeof frameRulesSchema>;

export const defaultFrameRules: FrameRules = { byteSet: '8-bit', letterCase: 'any', addressField: 'address' };
