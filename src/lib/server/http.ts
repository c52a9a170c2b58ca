import type { z } from 'zod';

/** Default cap for JSON request bodies, in bytes. */
export const DEFAULT_BODY_LIMIT = 64 * 1024;

export class HttpError extends Error {
  constructor(
    readonly status: number,
    message: string,
    readonly body: Record<string, unknown> = {},
  ) {
    super(message);
  }
}

export function json(data: unknown, status = 200, headers: HeadersInit = {}): Response {
  return jsonText(JSON.stringify(data), status, headers);
}

/** A JSON response from text that is JSON already (a page SQLite assembled, say). */
export function jsonText(text: string, status = 200, headers: HeadersInit = {}): Response {
  return new Response(text, {
    status,
    headers: { 'content-type': 'application/json; charset=utf-8', ...headers },
  });
}

/** Reads a JSON body of at most `limit` bytes; throws HttpError 413 / 400 / 415. */
export async function readJson(request: Request, limit = DEFAULT_BODY_LIMIT): Promise<unknown> {
  const type = request.headers.get('content-type') ?? '';
  if (!type.includes('application/json')) {
    throw new HttpError(415, 'Send the body as JSON (content-type: application/json).');
  }
  const bytes = await readBodyBytes(request, limit, () => new HttpError(413, `Request body is larger than ${limit} bytes.`));
  const text = new TextDecoder().decode(bytes);
  try {
    return JSON.parse(text);
  } catch {
    throw new HttpError(400, 'Request body is not valid JSON.');
  }
}

/**
 * Reads the whole body, refusing it with `tooLarge()` as soon as it passes `limit` bytes
 * (the declared Content-Length is checked first, the streamed byte count after).
 */
export async function readBodyBytes(request: Request, limit: number, tooLarge: () => HttpError): Promise<Uint8Array> {
  const declared = Number(request.headers.get('content-length') ?? '0');
  if (declared > limit) throw tooLarge();
  const reader = request.body?.getReader();
  if (!reader) throw new HttpError(400, 'Request body is empty.');
  const chunks: Uint8Array[] = [];
  let size = 0;
  for (;;) {
    const { done, value } = await reader.read();
    if (done) break;
    size += value.byteLength;
    if (size > limit) {
      await reader.cancel();
      throw tooLarge();
    }
    chunks.push(value);
  }
  return concat(chunks, size);
}

function concat(chunks: Uint8Array[], size: number): Uint8Array {
  const out = new Uint8Array(size);
  let offset = 0;
  for (const c of chunks) {
    out.set(c, offset);
    offset += c.byteLength;
  }
  return out;
}

/** Validates with a zod schema; on failure throws 422 with one message per field. */
export function validate<S extends z.ZodType>(schema: S, data: unknown): z.infer<S> {
  const result = schema.safeParse(data);
  if (result.success) return result.data;
  const fields: Record<string, string> = {};
  for (const issue of result.error.issues) {
    const key = issue.path.join('.') || '_';
    fields[key] ??= issue.message;
  }
  const first = result.error.issues[0];
  const where = first?.path.length ? `${first.path.join('.')}: ` : '';
  throw new HttpError(422, `${where}${first?.message ?? 'Invalid input'}`, { fields });
}

/** Wraps a route handler so thrown HttpErrors become JSON responses `{ error, ...body }`. */
export function route<C>(handler: (context: C) => Promise<Response> | Response) {
  return async (context: C): Promise<Response> => {
    try {
      return await handler(context);
    } catch (err) {
      if (err instanceof HttpError) return json({ error: err.message, ...err.body }, err.status);
      console.error(err);
      return json({ error: 'Internal error' }, 500);
    }
  };
}
