/** Limits of command sequences, in a module of their own so schemas can use them without the engine. */

/** `one-string`: the steps' bytes back to back in one send; `separate`: one send per step, `delayMs` apart. */
export const SEQUENCE_MODES = ['one-string', 'separate'] as const;
export type SequenceMode = (typeof SEQUENCE_MODES)[number];
/** Most steps a sequence has. */
export const MAX_SEQUENCE_STEPS = 32;
/** Longest delay between separate sends, ms (as the port's turnaround delay). */
export const MAX_SEQUENCE_DELAY_MS = 60_000;
/** Longest wait for one step's reply, ms. */
export const MAX_REPLY_WAIT_MS = 60_000;
