/**
 * The demo drive's command syntax — our own invention, not any maker's: `<address>!<VERB>:<args>` to act,
 * `<address>?<VERB>` to ask, replies `<address>=<VERB>:<data>`; arguments are `/<letter><number>`,
 * every frame ends with a carriage return, queries and replies carry `*` and an XOR-8 check in hex.
 */
import type { Template } from '../frame/template';
import { scaleFromStepsPerRev } from './scaling';

/** The demo drive is set to 36,000 steps per revolution (common practice for indexing tables). */
export const DEMO_STEPS_PER_REV = 36000;
const deg = scaleFromStepsPerRev(DEMO_STEPS_PER_REV);
/** rev/s and rev/s² → steps/s and steps/s². */
const perRev = { factor: DEMO_STEPS_PER_REV, offset: 0 };

const address = { type: 'integer', id: 'addr', name: 'address', label: 'Drive address', default: 1, min: 1, max: 31, pad: 'zero', sign: 'negative' } as const;
const cr = { type: 'terminator', id: 'cr', bytes: '0D' } as const;
const lit = (id: string, text: string) => ({ type: 'literal', id, bytes: [...text].map((c) => c.charCodeAt(0).toString(16).toUpperCase().padStart(2, '0')).join(' '), label: text }) as const;

export const indexMoveTemplate: Template = {
  version: 1,
  segments: [
    address, lit('verb', '!IDX:'),
    { type: 'integer', id: 'angle', name: 'angle', label: 'Index angle', unit: '°', scale: deg, sign: 'always', pad: 'zero', min: -360, max: 360, default: 45 },
    lit('r', '/R'), { type: 'integer', id: 'accel', name: 'accel', label: 'Acceleration', unit: 'rev/s²', scale: perRev, sign: 'negative', pad: 'zero', min: 0.1, max: 50, default: 5 },
    lit('f', '/F'), { type: 'integer', id: 'decel', name: 'decel', label: 'Deceleration', unit: 'rev/s²', scale: perRev, sign: 'negative', pad: 'zero', min: 0.1, max: 50, default: 5 },
    lit('s', '/S'), { type: 'integer', id: 'speed', name: 'speed', label: 'Velocity', unit: 'rev/s', scale: perRev, sign: 'negative', pad: 'zero', min: 0.01, max: 10, default: 0.5 },
    cr,
  ],
};

export const jogTemplate = (dir: '+' | '-'): Template => ({
  version: 1,
  segments: [
    address, lit('verb', '!JOG:'),
    { type: 'integer', id: 'angle', name: 'angle', label: 'Jog angle', unit: '°', scale: deg, sign: 'always', pad: 'zero', min: -10, max: 10, default: dir === '+' ? 1 : -1 },
    cr,
  ],
});

export const statusQueryTemplate: Template = {
  version: 1,
  segments: [address, lit('verb', '?STA'), lit('star', '*'), { type: 'checksum', id: 'bcc', algorithm: 'XOR-8', range: { from: 0, to: 1 }, over: 'bytes', encoding: 'ascii-hex', byteOrder: 'high-first', case: 'upper' }, cr],
};

export const statusReplyTemplate: Template = {
  version: 1,
  segments: [
    address, lit('verb', '=STA:'),
    { type: 'integer', id: 'pos', name: 'position', label: 'Position', unit: '°', scale: deg, sign: 'always', pad: 'zero', width: 8 },
    lit('comma', ','),
    { type: 'choice', id: 'state', name: 'state', label: 'State', options: [{ value: 'ready', label: 'Ready', send: 'R' }, { value: 'moving', label: 'Moving', send: 'M' }, { value: 'fault', label: 'Fault', send: 'F' }] },
    lit('star', '*'),
    { type: 'checksum', id: 'bcc', algorithm: 'XOR-8', range: { from: 0, to: 4 }, over: 'bytes', encoding: 'ascii-hex', byteOrder: 'high-first', case: 'upper' },
    cr,
  ],
};

/** The drive's acknowledgement of a move: `<address>=IDX:OK*<XOR-8>` CR when it starts, `NO` when it refuses. */
export const indexAckTemplate: Template = {
  version: 1,
  segments: [
    address, lit('verb', '=IDX:'),
    { type: 'choice', id: 'result', name: 'result', label: 'Result', options: [{ value: 'accepted', label: 'Accepted', send: 'OK' }, { value: 'refused', label: 'Refused', send: 'NO' }] },
    lit('star', '*'),
    { type: 'checksum', id: 'bcc', algorithm: 'XOR-8', range: { from: 0, to: 2 }, over: 'bytes', encoding: 'ascii-hex', byteOrder: 'high-first', case: 'upper' },
    cr,
  ],
};

/**
 * The drive's setup command for its service line: `<address>!LIN:<baud>,<parity letter>,<data bits>,<stop bits>` CR,
 * e.g. `1!LIN:9600,N,8,1` CR. The drive answers at the framing it heard, then takes on the new one.
 */
export const lineSetupTemplate: Template = {
  version: 1,
  segments: [
    address, lit('verb', '!LIN:'),
    { type: 'integer', id: 'baud', name: 'baud', label: 'Baud', unit: 'bit/s', sign: 'negative', pad: 'zero', min: 1200, max: 115200, default: 9600 },
    lit('c1', ','),
    { type: 'choice', id: 'parity', name: 'parity', label: 'Parity', options: [{ value: 'none', label: 'None', send: 'N' }, { value: 'even', label: 'Even', send: 'E' }, { value: 'odd', label: 'Odd', send: 'O' }] },
    lit('c2', ','),
    { type: 'integer', id: 'bits', name: 'dataBits', label: 'Data bits', sign: 'negative', pad: 'zero', min: 7, max: 8, default: 8 },
    lit('c3', ','),
    { type: 'integer', id: 'stop', name: 'stopBits', label: 'Stop bits', sign: 'negative', pad: 'zero', min: 1, max: 2, default: 1 },
    cr,
  ],
};

/** The drive's acknowledgement of new line settings: `<address>=LIN:OK*<XOR-8>` CR, `NO` when it refuses them. */
export const lineAckTemplate: Template = {
  version: 1,
  segments: [
    address, lit('verb', '=LIN:'),
    { type: 'choice', id: 'result', name: 'result', label: 'Result', options: [{ value: 'accepted', label: 'Accepted', send: 'OK' }, { value: 'refused', label: 'Refused', send: 'NO' }] },
    lit('star', '*'),
    { type: 'checksum', id: 'bcc', algorithm: 'XOR-8', range: { from: 0, to: 2 }, over: 'bytes', encoding: 'ascii-hex', byteOrder: 'high-first', case: 'upper' },
    cr,
  ],
};
