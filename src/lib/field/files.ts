/** What an uploaded file is, judged by its first bytes, and a safe name to store and serve it under. */

export type AttachmentKind = 'manual' | 'photo' | 'config';
export type SniffedType = 'application/pdf' | 'image/jpeg' | 'image/png' | 'image/webp';

export const KIND_LABELS: Record<AttachmentKind, string> = {
  manual: 'Manual (PDF)',
  photo: 'Photo (JPEG, PNG or WebP)',
  config: 'Configuration file (any type)',
};

const PNG = [0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a];

function startsWith(bytes: Uint8Array, sig: number[], at = 0): boolean {
  if (bytes.length < at + sig.length) return false;
  return sig.every((b, i) => bytes[at + i] === b);
}

const ascii = (s: string) => [...s].map((c) => c.charCodeAt(0));

/** The type the content really has (PDF, JPEG, PNG, WebP), or null for anything else. */
export function sniffType(head: Uint8Array): SniffedType | null {
  if (startsWith(head, ascii('%PDF-'))) return 'application/pdf';
  if (startsWith(head, [0xff, 0xd8, 0xff])) return 'image/jpeg';
  if (startsWith(head, PNG)) return 'image/png';
  if (startsWith(head, ascii('RIFF')) && startsWith(head, ascii('WEBP'), 8)) return 'image/webp';
  return null;
}

/**
 * Checks content against the chosen kind. A manual must be a PDF and a photo an image, whatever the
 * file is called; a configuration file may be anything and is always served as a download.
 */
export function checkKind(kind: AttachmentKind, head: Uint8Array): { ok: true; contentType: string } | { ok: false; message: string } {
  const sniffed = sniffType(head);
  if (kind === 'manual') {
    return sniffed === 'application/pdf' ? { ok: true, contentType: sniffed } : { ok: false, message: 'This file is not a PDF (its content does not start with %PDF-); upload it as a configuration file instead.' };
  }
  if (kind === 'photo') {
    return sniffed && sniffed.startsWith('image/')
      ? { ok: true, contentType: sniffed }
      : { ok: false, message: 'This file is not a JPEG, PNG or WebP image (checked by its content, not its name).' };
  }
  return { ok: true, contentType: 'application/octet-stream' };
}

/** Inline display is allowed only for content we recognised ourselves. */
export function isInlineType(contentType: string): boolean {
  return contentType === 'application/pdf' || contentType === 'image/jpeg' || contentType === 'image/png' || contentType === 'image/webp';
}

/**
 * Keeps letters, digits, dot, dash, underscore and space; drops any folder part, control characters
 * and leading dots; at most 120 characters, keeping the extension.
 */
export function sanitiseFileName(raw: string): string {
  const base = raw.split(/[\\/]/).pop() ?? '';
  let name = base
    .normalize('NFKC')
    .replace(/[^\p{L}\p{N}._ -]+/gu, '_')
    .replace(/\s+/g, ' ')
    .replace(/_+/g, '_')
    .replace(/^[.\s_-]+/, '')
    .trim();
  if (name.length > 120) {
    const dot = name.lastIndexOf('.');
    const ext = dot > 0 && name.length - dot <= 10 ? name.slice(dot) : '';
    name = name.slice(0, 120 - ext.length) + ext;
  }
  return name || 'file';
}

export function formatBytes(n: number): string {
  if (n < 1024) return `${n} B`;
  if (n < 1024 * 1024) return `${(n / 1024).toFixed(1)} KB`;
  return `${(n / 1024 / 1024).toFixed(1)} MB`;
}
