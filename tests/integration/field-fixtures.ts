/** Builders for field-work tests: uploads (multipart like the browser, or raw), log entries, shares. */
import type { TestClient } from '../helpers/client';
import { expectOk } from './vault-fixtures';

/** A 1×1 PNG (valid signature and chunks). */
export const PNG_BYTES = Uint8Array.from(Buffer.from('iVBORw0KGgoAAAANSUhEUgAAAAEAAAABCAYAAAAfFcSJAAAADUlEQVR42mP8z8DwHwAFBQIAX8jx0gAAAABJRU5ErkJggg==', 'base64'));
export const PDF_BYTES = new TextEncoder().encode('%PDF-1.4\n1 0 obj<<>>endobj\ntrailer<<>>\n%%EOF\n');

/** POST /api/attachments as multipart/form-data, with the client's session. */
export async function upload(c: TestClient, fields: Record<string, string>, bytes: Uint8Array, fileName: string, type = 'application/octet-stream') {
  const form = new FormData();
  for (const [k, v] of Object.entries(fields)) form.append(k, v);
  form.append('file', new Blob([bytes as Uint8Array<ArrayBuffer>], { type }), fileName);
  const res = await fetch(`${c.baseUrl}/api/attachments`, {
    method: 'POST',
    headers: { origin: c.baseUrl, 'x-forwarded-for': c.ip, cookie: [...c.cookies].map(([k, v]) => `${k}=${v}`).join('; ') },
    body: form,
  });
  const text = await res.text();
  let body: any = text;
  try { body = JSON.parse(text); } catch { /* not JSON */ }
  return { status: res.status, body, headers: res.headers };
}

/** Raw download with the client's session (headers and bytes). */
export async function download(c: TestClient, path: string) {
  const res = await fetch(c.baseUrl + path, { headers: { 'x-forwarded-for': c.ip, cookie: [...c.cookies].map(([k, v]) => `${k}=${v}`).join('; ') } });
  return { status: res.status, headers: res.headers, bytes: new Uint8Array(await res.arrayBuffer()) };
}

export async function rawUpload(c: TestClient, deviceId: string, text = 'baud=9600\n') {
  return expectOk(await c.request('POST', `/api/attachments?ownerType=device&ownerId=${deviceId}&kind=config&name=drive.cfg`, text, { 'content-type': 'application/octet-stream' }), 201);
}

export async function logEntry(c: TestClient, deviceId: string, body: Record<string, unknown> = { kind: 'verified', note: 'Polled OK' }) {
  return expectOk(await c.post(`/api/devices/${deviceId}/field-log`, body), 201);
}

export async function makeShare(c: TestClient, scopeType: 'machine' | 'site', scopeId: string, extra: Record<string, unknown> = {}) {
  return expectOk(await c.post('/api/shares', { scopeType, scopeId, ...extra }), 201);
}
