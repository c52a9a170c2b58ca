/** Sends a body with XMLHttpRequest so the island can show upload progress; answers parsed JSON or throws ApiError. */
import { ApiError } from '../../lib/client/api';

export function sendWithProgress<T>(method: string, url: string, body: FormData | string, onProgress: (fraction: number) => void, contentType?: string): Promise<T> {
  return new Promise((resolve, reject) => {
    const xhr = new XMLHttpRequest();
    xhr.open(method, url);
    if (contentType) xhr.setRequestHeader('content-type', contentType);
    xhr.upload.onprogress = (e) => e.lengthComputable && onProgress(e.loaded / e.total);
    xhr.onerror = () => reject(new ApiError(0, 'The connection dropped; check the network and try again.'));
    xhr.onload = () => {
      let data: any = null;
      try {
        data = xhr.responseText ? JSON.parse(xhr.responseText) : null;
      } catch {
        data = null;
      }
      onProgress(1);
      if (xhr.status >= 200 && xhr.status < 300) resolve(data as T);
      else reject(new ApiError(xhr.status, data?.error ?? `Request failed (${xhr.status}).`, data?.fields ?? {}, data ?? {}));
    };
    xhr.send(body);
  });
}

export function uploadFile<T>(fields: Record<string, string>, file: File, onProgress: (fraction: number) => void): Promise<T> {
  const form = new FormData();
  for (const [k, v] of Object.entries(fields)) form.append(k, v);
  form.append('file', file, file.name);
  return sendWithProgress<T>('POST', '/api/attachments', form, onProgress);
}

export function Progress({ value, label }: { value: number; label: string }) {
  const pct = Math.round(value * 100);
  return (
    <div className="grid gap-1" role="progressbar" aria-label={label} aria-valuemin={0} aria-valuemax={100} aria-valuenow={pct}>
      <div className="flex justify-between text-sm"><span>{label}</span><span>{pct}%</span></div>
      <div className="h-3 rounded bg-line overflow-hidden"><div className="h-full bg-accent" style={{ width: `${pct}%` }} /></div>
    </div>
  );
}
