/** Reads an upload body with the size limit enforced while streaming: multipart/form-data, or the raw file bytes. */
import { readBodyBytes } from '../http';
import { formatBytes } from '../../field/files';
import { BadRequest, Invalid, TooLarge } from '../errors';

/** Room for multipart boundaries and the small text fields around the file. */
const MULTIPART_OVERHEAD = 64 * 1024;

export interface UploadBody {
  fields: Record<string, string>;
  fileName: string;
  bytes: Uint8Array;
}

const tooLarge = (max: number) => new TooLarge(`The file is larger than the ${formatBytes(max)} limit.`, { maxBytes: max });

function readLimited(request: Request, limit: number, max: number): Promise<Uint8Array> {
  return readBodyBytes(request, limit, () => tooLarge(max));
}

/**
 * multipart/form-data: the file in field `file`, other fields as text. Any other content type:
 * the body is the file itself and the fields come from the query string (for scripts).
 */
export async function readUpload(request: Request, url: URL, max: number): Promise<UploadBody> {
  const type = request.headers.get('content-type') ?? '';
  if (type.startsWith('multipart/form-data')) {
    const raw = await readLimited(request, max + MULTIPART_OVERHEAD, max);
    let form: FormData;
    try {
      form = await new Response(raw as Uint8Array<ArrayBuffer>, { headers: { 'content-type': type } }).formData();
    } catch {
      throw new BadRequest('The multipart body could not be read.');
    }
    const fields: Record<string, string> = {};
    let file: File | null = null;
    for (const [k, v] of form) {
      if (typeof v === 'string') fields[k] = v;
      else if (k === 'file') file = v;
    }
    if (!file) throw new Invalid('file: choose a file to upload', { fields: { file: 'Choose a file to upload.' } });
    if (file.size > max) throw tooLarge(max);
    return { fields, fileName: fields.name || file.name, bytes: new Uint8Array(await file.arrayBuffer()) };
  }
  const bytes = await readLimited(request, max, max);
  const fields = Object.fromEntries(url.searchParams);
  return { fields, fileName: fields.name ?? '', bytes };
}
