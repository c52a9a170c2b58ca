/** Serial port settings model, shared by the frame engine, the link checks and the settings vault. How they read in words: ./port-text.ts. */
import { z } from 'zod';
import { defaultFrameRules, frameRulesSchema } from './frame-rules';

export const INTERFACES = ['rs232', 'rs422', 'rs485-2w', 'rs485-4w', 'ttl', 'usb-vcp', 'tcp'] as const;
export const PARITIES = ['none', 'even', 'odd', 'mark', 'space'] as const;
export const HANDSHAKES = ['none', 'rts-cts', 'xon-xoff', 'dtr-dsr'] as const;
export const PROTOCOLS = ['ascii', 'modbus-rtu', 'modbus-ascii', 'other'] as const;
export const RS485_DIRECTIONS = ['none', 'rts', 'auto'] as const;
/** RTS: held off, held on, raised while the port transmits, or hardware flow control (raised while it can receive). */
export const RTS_MODES = ['off', 'on', 'transmit', 'flow'] as const;
/** CTS: ignored, or the port sends only while CTS is raised. */
export const CTS_MODES = ['ignore', 'gate'] as const;
/** DTR: held off, held on, or DTR/DSR flow control. */
export const DTR_MODES = ['off', 'on', 'flow'] as const;
/** Longest RTS lead or tail a port takes, in milliseconds. */
export const MAX_RTS_DELAY_MS = 1000;

export type PortInterface = (typeof INTERFACES)[number];
export type Parity = (typeof PARITIES)[number];
export type Handshake = (typeof HANDSHAKES)[number];
export type Protocol = (typeof PROTOCOLS)[number];
export type Rs485Direction = (typeof RS485_DIRECTIONS)[number];
export type RtsMode = (typeof RTS_MODES)[number];
export type CtsMode = (typeof CTS_MODES)[number];
export type DtrMode = (typeof DTR_MODES)[number];
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

/**
 * The settings object itself, every key with its default. Parse through `portSettingsSchema` (or a schema made
 * with `withControlLines`), which first fills the control-line keys from the older keys or the other way round.
 */
export const portSettingsObjectSchema = z
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
    /** What the port does with RTS. `transmit` is `rs485Direction: "rts"`; `flow` with `ctsMode: "gate"` is `handshake: "rts-cts"`. */
    rtsMode: z.enum(RTS_MODES).default('off'),
    /** Whether the port waits for CTS before sending. */
    ctsMode: z.enum(CTS_MODES).default('ignore'),
    /** What the port does with DTR. `flow` is `handshake: "dtr-dsr"`. */
    dtrMode: z.enum(DTR_MODES).default('off'),
    /** Milliseconds RTS is raised before the first start bit (with `rtsMode: "transmit"`). */
    rtsLeadMs: z.number().nonnegative().max(MAX_RTS_DELAY_MS).default(0),
    /** Milliseconds RTS stays raised after the transmit buffer empties (with `rtsMode: "transmit"`). */
    rtsTailMs: z.number().nonnegative().max(MAX_RTS_DELAY_MS).default(0),
    /** The port hears its own transmission (2-wire RS-485 with the receiver left on). */
    echo: z.boolean().default(false),
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
    for (const d of controlLineDisagreements(s)) ctx.addIssue({ code: 'custom', path: [d.path], message: d.message });
    if (s.interface !== 'tcp') return;
    if (!s.tcpHost) ctx.addIssue({ code: 'custom', path: ['tcpHost'], message: 'A TCP connection needs a host' });
    if (!s.tcpPort) ctx.addIssue({ code: 'custom', path: ['tcpPort'], message: 'A TCP connection needs a port' });
  });

/**
 * A schema that fills the control-line keys before `schema` checks the body: where `rtsMode`, `ctsMode` or
 * `dtrMode` is missing it is derived from `handshake` and `rs485Direction`, and where those are missing they are
 * derived from the new keys (`fillControlLines`). Keys given on both sides must agree (else 422 naming both).
 */
export function withControlLines<T extends z.ZodType>(schema: T) {
  return z.preprocess(fillControlLines, schema);
}

export const portSettingsSchema = withControlLines(portSettingsObjectSchema);

export type PortSettings = z.output<typeof portSettingsObjectSchema>;
export type PortSettingsInput = z.input<typeof portSettingsObjectSchema>;

type ControlKeys = Pick<PortSettings, 'handshake' | 'rs485Direction' | 'rtsMode' | 'ctsMode' | 'dtrMode'>;
type Lines = Pick<PortSettings, 'rtsMode' | 'ctsMode' | 'dtrMode'>;
type OldKeys = Pick<PortSettings, 'handshake' | 'rs485Direction'>;

/**
 * The control lines the older keys mean (docs/decisions/013): `rs485Direction: "rts"` → RTS raised while
 * transmitting; `handshake: "rts-cts"` → RTS flow control and CTS gating; `"dtr-dsr"` → DTR flow control;
 * anything else leaves the lines off and CTS ignored. Missing keys count as their defaults.
 */
export function linesFromOldKeys(s: Partial<OldKeys>): Lines {
  const handshake = s.handshake ?? 'none';
  return {
    rtsMode: s.rs485Direction === 'rts' ? 'transmit' : handshake === 'rts-cts' ? 'flow' : 'off',
    ctsMode: handshake === 'rts-cts' ? 'gate' : 'ignore',
    dtrMode: handshake === 'dtr-dsr' ? 'flow' : 'off',
  };
}

/**
 * The older keys the control lines mean. `xon-xoff` (software flow control) and automatic RS-485 direction have
 * no control line of their own, so they are kept from `was` when the lines leave room for them.
 */
export function oldKeysFromLines(l: Partial<Lines>, was: Partial<OldKeys> = {}): OldKeys {
  const rtsCts = l.rtsMode === 'flow' && l.ctsMode === 'gate';
  return {
    handshake: rtsCts ? 'rts-cts' : l.dtrMode === 'flow' ? 'dtr-dsr' : was.handshake === 'xon-xoff' ? 'xon-xoff' : 'none',
    rs485Direction: l.rtsMode === 'transmit' ? 'rts' : was.rs485Direction === 'auto' ? 'auto' : 'none',
  };
}

const LINE_KEYS = ['rtsMode', 'ctsMode', 'dtrMode'] as const;
const isObject = (v: unknown): v is Record<string, unknown> => !!v && typeof v === 'object' && !Array.isArray(v);

/**
 * A settings body with both sides present: each missing control line derived from the older keys
 * (`linesFromOldKeys`; missing older keys count as their defaults), then the missing older keys from the lines. Keys the body gives
 * are never changed, so a disagreement stays for the schema to refuse. Anything but an object passes through.
 */
export function fillControlLines(raw: unknown): unknown {
  if (!isObject(raw)) return raw;
  const out: Record<string, unknown> = { ...raw };
  const derived = linesFromOldKeys(raw as Partial<OldKeys>);
  for (const k of LINE_KEYS) if (out[k] === undefined) out[k] = derived[k];
  const old = oldKeysFromLines(out as Partial<Lines>, raw as Partial<OldKeys>);
  if (out.handshake === undefined) out.handshake = old.handshake;
  if (out.rs485Direction === undefined) out.rs485Direction = old.rs485Direction;
  return out;
}

const q = (v: unknown) => JSON.stringify(v);

/** Where the older keys and the control lines say different things, one message naming both keys. */
export function controlLineDisagreements(s: ControlKeys): { path: keyof ControlKeys; message: string }[] {
  const out: { path: keyof ControlKeys; message: string }[] = [];
  const known = HANDSHAKES.includes(s.handshake) && RS485_DIRECTIONS.includes(s.rs485Direction) && RTS_MODES.includes(s.rtsMode)
    && CTS_MODES.includes(s.ctsMode) && DTR_MODES.includes(s.dtrMode);
  if (!known) return out; // an unknown value has its own message
  if (s.handshake === 'rts-cts' && (s.rs485Direction === 'rts' || s.rtsMode === 'transmit')) {
    const other = s.rs485Direction === 'rts' && s.rtsMode === 'transmit' ? 'rs485Direction "rts" (rtsMode "transmit")' : s.rtsMode === 'transmit' ? 'rtsMode "transmit"' : 'rs485Direction "rts"';
    out.push({ path: 'handshake', message: `handshake "rts-cts" needs RTS for flow control (rtsMode "flow"), but ${other} raises it while transmitting; RTS does one or the other, not both.` });
    return out;
  }
  const want = oldKeysFromLines(s, s);
  if (want.handshake !== s.handshake) {
    const lines = s.handshake === 'rts-cts' ? `rtsMode ${q(s.rtsMode)} and ctsMode ${q(s.ctsMode)}` : s.handshake === 'dtr-dsr' ? `dtrMode ${q(s.dtrMode)}`
      : want.handshake === 'rts-cts' ? `rtsMode ${q(s.rtsMode)} and ctsMode ${q(s.ctsMode)}` : `dtrMode ${q(s.dtrMode)}`;
    out.push({ path: 'handshake', message: `handshake ${q(s.handshake)} disagrees with ${lines} (which mean handshake ${q(want.handshake)}). Send the same choice in both, or only one of them.` });
  }
  if (want.rs485Direction !== s.rs485Direction) {
    out.push({ path: 'rs485Direction', message: `rs485Direction ${q(s.rs485Direction)} disagrees with rtsMode ${q(s.rtsMode)} (rs485Direction "rts" is rtsMode "transmit"). Send the same choice in both, or only one of them.` });
  }
  return out;
}

/** 9600 8-N-1 on RS-232 without handshaking (common practice). */
export const defaultPortSettings: PortSettings = {
  interface: 'rs232',
  baud: 9600,
  dataBits: 8,
  parity: 'none',
  stopBits: 1,
  handshake: 'none',
  rs485Direction: 'none',
  rtsMode: 'off',
  ctsMode: 'ignore',
  dtrMode: 'off',
  rtsLeadMs: 0,
  rtsTailMs: 0,
  echo: false,
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

/**
 * The five control-line keys after the user changed one of them in a form, the others moved to agree: choosing
 * RTS/CTS handshaking sets RTS to flow control and CTS to gating (and drops RS-485 direction by RTS), leaving it
 * clears them; DTR/DSR likewise with DTR; RS-485 direction by RTS sets RTS on while transmitting, leaving it
 * switches RTS off; a changed line recomputes `handshake` and `rs485Direction` (`oldKeysFromLines`).
 */
export function alignControlLines(s: ControlKeys, changed: keyof ControlKeys): ControlKeys {
  const next = { ...s };
  if (changed === 'handshake') {
    const rtsCts = next.rtsMode === 'flow' && next.ctsMode === 'gate';
    if (s.handshake === 'rts-cts') Object.assign(next, { rtsMode: 'flow', ctsMode: 'gate' });
    else if (rtsCts) Object.assign(next, { rtsMode: 'off', ctsMode: 'ignore' });
    if (s.handshake === 'dtr-dsr') next.dtrMode = 'flow';
    else if (s.handshake !== 'rts-cts' && next.dtrMode === 'flow') next.dtrMode = 'off';
  } else if (changed === 'rs485Direction') {
    if (s.rs485Direction === 'rts') next.rtsMode = 'transmit';
    else if (next.rtsMode === 'transmit') next.rtsMode = 'off';
  }
  return { ...next, ...oldKeysFromLines(next, s) };
}
