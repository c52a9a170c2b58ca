/** Findings: what the checks report, with a byte range for highlighting when there is one. */

export type Severity = 'error' | 'warning' | 'info';

/** Every finding code the frame engine emits; stable, so UIs and tests can key on them. */
export const FINDING_CODES = [
  // assembly of fields (assembleFrame)
  'field-missing', 'field-invalid', 'field-out-of-range', 'field-not-integer', 'field-rounded', 'field-too-wide',
  'field-too-long', 'field-invalid-char', 'checksum-not-hex',
  // frame rules (checkFrame)
  'empty-frame', 'missing-start', 'missing-terminator', 'start-in-payload', 'terminator-in-payload', 'forbidden-byte',
  'byte-exceeds-data-bits', 'byte-outside-set', 'frame-too-long', 'wrong-case', 'address-out-of-range',
  // checksum settings against the port's protocol (previewFrame)
  'checksum-byte-order', 'checksum-over-characters',
  // reply decoding (decodeReply)
  'reply-mismatch', 'reply-too-short', 'reply-extra-bytes', 'reply-field-unreadable', 'checksum-mismatch',
  // command sequences (assembleSequence)
  'step-unterminated', 'plc-string-too-long', 'plc-string-may-overflow', 'step-wait-without-reply', 'step-wait-in-one-string',
  // saved sequences (a step whose library command is in the trash or purged)
  'step-command-missing',
] as const;
export type FindingCode = (typeof FINDING_CODES)[number];

export interface Finding {
  severity: Severity;
  code: FindingCode;
  /** Plain English: what is wrong and what to do. */
  message: string;
  /** Byte range [start, end) in the frame. */
  range?: [number, number];
  /** Template segment the finding belongs to. */
  segmentId?: string;
}

/** True when no finding is an error. */
export function isClean(findings: readonly { severity: Severity }[]): boolean {
  for (const f of findings) if (f.severity === 'error') return false;
  return true;
}

/** 'error' if any error, 'warning' if any warning, else 'ok' (red / amber / green). */
export function overallState(findings: readonly { severity: Severity }[]): 'ok' | 'warning' | 'error' {
  let state: 'ok' | 'warning' | 'error' = 'ok';
  for (const f of findings) {
    if (f.severity === 'error') return 'error';
    if (f.severity === 'warning') state = 'warning';
  }
  return state;
}
