import type { z } from 'zod';
import { nextTurn } from './jobs/turns';
import { AppError, BadRequest, Conflict, Duplicate, Forbidden, Gone, Invalid, NotFound, ReferenceMissing, Stale, TooLarge, Unauthenticated, Unsupported } from './errors';

/** Default cap for JSON request bodies, in bytes. */
export const DEFAULT_BODY_LIMIT = 64 * 1024;

/** An error with its status chosen on the spot; services throw the named errors of ./errors.ts instead. */
export class HttpError extends AppError {
  constructor(
    readonly status: number,
    message: string,
    body: Record<string, unknown> = {},
  ) {
    super(message, body);
  }
}

/** The named errors and their HTTP status: the one place the catalogue meets HTTP. */
const STATUS: [new (...args: never[]) => AppError, number][] = [
  [BadRequest, 400],
  [Unauthenticated, 401],
  [Forbidden, 403],
  [NotFound, 404],
  [Stale, 409],
  [Conflict, 409],
  [ReferenceMissing, 409],
  [Gone, 410],
  [TooLarge, 413],
  [Unsupported, 415],
  [Duplicate, 422],
  [Invalid, 422],
];

export function httpStatus(err: AppError): number {
  if (err instanceof HttpError) return err.status;
  for (const [kind, status] of STATUS) if (err instanceof kind) return status;
  return 500;
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

/** A Structured Text file to download (never cached: it is the library as it stands). */
export function stFile(file: { name: string; text: string }): Response {
  return new Response(file.text, {
    headers: { 'content-type': 'text/plain; charset=utf-8', 'content-disposition': `attachment; filename="${file.name}"`, 'cache-control': 'no-store' },
  });
}

/** Reads a JSON body of at most `limit` bytes; throws TooLarge / BadRequest / Unsupported. */
export async function readJson(request: Request, limit = DEFAULT_BODY_LIMIT): Promise<unknown> {
  const type = request.headers.get('content-type') ?? '';
  if (!type.includes('application/json')) {
    throw new Unsupported('Send the body as JSON (content-type: application/json).');
  }
  const bytes = await readBodyBytes(request, limit, () => new TooLarge(`Request body is larger than ${limit} bytes.`));
  // A large body's decoding and parsing take tens of ms each: other requests get a turn before each.
  const large = bytes.byteLength > TURN_EVERY_BYTES;
  if (large) await nextTurn();
  const text = new TextDecoder().decode(bytes);
  if (large) await nextTurn();
  try {
    return JSON.parse(text);
  } catch {
    throw new BadRequest('Request body is not valid JSON.');
  }
}

/** Body bytes read between turns for other requests. */
const TURN_EVERY_BYTES = 1024 * 1024;

/**
 * Reads the whole body, refusing it with `tooLarge()` as soon as it passes `limit` bytes
 * (the declared Content-Length is checked first, the streamed byte count after).
 */
export async function readBodyBytes(request: Request, limit: number, tooLarge: () => AppError): Promise<Uint8Array> {
  const declared = Number(request.headers.get('content-length') ?? '0');
  if (declared > limit) throw tooLarge();
  const reader = request.body?.getReader();
  if (!reader) throw new BadRequest('Request body is empty.');
  const chunks: Uint8Array[] = [];
  let size = 0;
  let sinceTurn = 0;
  for (;;) {
    const { done, value } = await reader.read();
    if (done) break;
    size += value.byteLength;
    // A body already received is read chunk after chunk without the event loop getting a turn (each read settles at
    // once): a 4.5 MB import held every other request for 80 ms. Other requests get theirs every megabyte or so.
    sinceTurn += value.byteLength;
    if (sinceTurn >= TURN_EVERY_BYTES) {
      sinceTurn = 0;
      await nextTurn();
    }
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
  throw new Invalid(`${where}${first?.message ?? 'Invalid input'}`, { fields });
}

/** Wraps a route handler so thrown named errors become JSON responses `{ error, ...details }` with their status. */
export function route<C>(handler: (context: C) => Promise<Response> | Response) {
  return async (context: C): Promise<Response> => {
    try {
      return await handler(context);
    } catch (err) {
      if (err instanceof AppError) {
        const status = httpStatus(err);
        if (status === 500) console.error(err);
        return json(status === 500 ? { error: 'Internal error' } : { error: err.message, ...err.details }, status);
      }
      console.error(err);
      return json({ error: 'Internal error' }, 500);
    }
  };
}
