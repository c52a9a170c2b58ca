/** Serial port settings model, shared by the frame engine, the link checks and the settings vault. How they read in words: ./port-text.ts. */
import { z } from 'zod';
import { defaultFrameRules, frameRulesSchema } from './frame-rules';

export const INTERFACES = ['rs232', 'rs422', 'rs485-2w', 'rs485-4w', 'ttl', 'usb-vcp', 'tcp'] as const;
export const PARITIES = ['none', 'even', 'odd', 'mark', 'space'] as const;
export const HANDSHAKES = ['none', 'rts-cts', 'xon-xoff', 'dtr-dsr'] as const;
export const PROTOCOLS = ['ascii', 'modbus-rtu', 'modbus-ascii', 'other'] as const;
export const RS485_DIRECTIONS = ['none', 'rts', 'auto'] as const;

export type PortInterface = (typeof INTERFACES)[number];
export type Parity = (typeof PARITIES)[number];
export type Handshake = (typeof HANDSHAKES)[number];
export type Protocol = (typeof PROTOCOLS)[number];
export type Rs485Direction = (typeof RS485_DIRECTIONS)[number];
export type StopBits = 1 | 1.5 | 2;

/** Common UART bit rates, bit/s. Other positive integers are allowed. */
export const STANDARD_BAUD_RATES = [
  300, 600, 1200, 2400, 4800, 9600, 14400, 19200, 28800, 38400, 57600, 76800, 115200, 230400, 460800, 921600,
] as const;

/** The four settings that define a character on the line. */
export const lineSettingsSchema = z.object({
  baud: z.number().int().positive().max(100_000_000),
  dataBits: z.number().int().min(5).max(8),
  parity: z.enum(PARITIES),
  stopBits: z.union([z.literal(1), z.literal(1.5), z.literal(2)]),
});
export type LineSettings = z.infer<typeof lineSettingsSchema>;

export const portSettingsSchema = z
  .object({
    interface: z.enum(INTERFACES).default('rs232'),
    tcpHost: z.string().max(253).optional(),
    tcpPort: z.number().int().min(1).max(65535).optional(),
    baud: z.number().int().positive().max(100_000_000).default(9600),
    dataBits: z.number().int().min(5).max(8).default(8),
    parity: z.enum(PARITIES).default('none'),
    stopBits: z.union([z.literal(1), z.literal(1.5), z.literal(2)]).default(1),
    handshake: z.enum(HANDSHAKES).default('none'),
    /** How a 2-wire RS-485 transmitter is switched on: by the RTS line, automatically, or not at all. */
    rs485Direction: z.enum(RS485_DIRECTIONS).default('none'),
    /** Device address on a bus (Modbus: 1-247), or null when the protocol has none. */
    nodeAddress: z.number().int().min(0).max(65535).nullable().default(null),
    /** Line termination resistor switched in at this device. */
    termination: z.boolean().default(false),
    /** Fail-safe bias (pull-up/pull-down) switched in at this device. */
    bias: z.boolean().default(false),
    /** Milliseconds to wait for the start of a reply. */
    responseTimeoutMs: z.number().nonnegative().max(600_000).default(1000),
    /** Milliseconds of silence inside a reply that end it. */
    interCharTimeoutMs: z.number().nonnegative().max(60_000).default(0),
    /** Milliseconds the master waits after a reply (or broadcast) before sending again. */
    turnaroundDelayMs: z.number().nonnegative().max(60_000).default(0),
    retries: z.number().int().min(0).max(100).default(0),
    protocol: z.enum(PROTOCOLS).default('ascii'),
    frameRules: frameRulesSchema.default(defaultFrameRules),
  })
  .superRefine((s, ctx) => {
    if (s.interface !== 'tcp') return;
    if (!s.tcpHost) ctx.addIssue({ code: 'custom', path: ['tcpHost'], message: 'A TCP connection needs a host' });
    if (!s.tcpPort) ctx.addIssue({ code: 'custom', path: ['tcpPort'], message: 'A TCP connection needs a port' });
  });

export type PortSettings = z.infer<typeof portSettingsSchema>;
export type PortSettingsInput = z.input<typeof portSettingsSchema>;

/** 9600 8-N-1 on RS-232 without handshaking (common practice). */
export const defaultPortSettings: PortSettings = {
  interface: 'rs232',
  baud: 9600,
  dataBits: 8,
  parity: 'none',
  stopBits: 1,
  handshake: 'none',
  rs485Direction: 'none',
  nodeAddress: null,
  termination: false,
  bias: false,
  responseTimeoutMs: 1000,
  interCharTimeoutMs: 0,
  turnaroundDelayMs: 0,
  retries: 0,
  protocol: 'ascii',
  frameRules: defaultFrameRules,
};
