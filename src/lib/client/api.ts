/** Browser-side calls to the app's API routes: JSON in, JSON out, errors as ApiError. */
export class ApiError extends Error {
  constructor(
    readonly status: number,
    message: string,
    readonly fields: Record<string, string> = {},
    readonly body: Record<string, unknown> = {},
  ) {
    super(message);
  }
}

export async function api<T = unknown>(path: string, init: { method?: string; body?: unknown } = {}): Promise<T> {
  const res = await fetch(path, {
    method: init.method ?? (init.body === undefined ? 'GET' : 'POST'),
    headers: init.body === undefined ? {} : { 'content-type': 'application/json' },
    body: init.body === undefined ? undefined : JSON.stringify(init.body),
    credentials: 'same-origin',
  });
  const text = await res.text();
  let data: any = null;
  try {
    data = text ? JSON.parse(text) : null;
  } catch {
    data = null;
  }
  if (!res.ok) {
    const message = data?.error ?? data?.message ?? `Request failed (${res.status}).`;
    throw new ApiError(res.status, message, data?.fields ?? {}, data ?? {});
  }
  return data as T;
}

/** A 409 that carries the record as it is now (a stale version): the conflict notice's cue. */
export function isStale(e: unknown): e is ApiError & { body: { current: Record<string, unknown> & { version?: number } } } {
  return e instanceof ApiError && e.status === 409 && !!e.body.current && typeof e.body.current === 'object';
}
