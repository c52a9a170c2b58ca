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

/** What a call says when the request never reached the server (no network, or the server down). */
export const NO_NETWORK = 'The server could not be reached (no network?): nothing was sent. Try again when the network returns.';

export async function api<T = unknown>(path: string, init: { method?: string; body?: unknown } = {}): Promise<T> {
  let res: Response;
  try {
    res = await fetch(path, {
      method: init.method ?? (init.body === undefined ? 'GET' : 'POST'),
      headers: init.body === undefined ? {} : { 'content-type': 'application/json' },
      body: init.body === undefined ? undefined : JSON.stringify(init.body),
      credentials: 'same-origin',
    });
  } catch {
    // fetch rejects only when no answer came at all; the browser's own words ("Failed to fetch") say nothing useful.
    throw new ApiError(0, NO_NETWORK);
  }
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
