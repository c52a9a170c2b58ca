/** Where attachment bytes live: one interface, a local folder or an S3-compatible bucket behind it. */
import { mkdir, readdir, readFile, rm, stat, writeFile } from 'node:fs/promises';
import { dirname, join, resolve, sep } from 'node:path';
import { DeleteObjectCommand, GetObjectCommand, ListObjectsV2Command, PutObjectCommand, S3Client } from '@aws-sdk/client-s3';
import { config, type S3Settings } from '../../../config';

export interface FileStorage {
  readonly name: 'local' | 's3';
  put(key: string, bytes: Uint8Array, contentType: string): Promise<void>;
  /** The stored bytes, or null when nothing is stored under `key`. */
  get(key: string): Promise<Uint8Array | null>;
  delete(key: string): Promise<void>;
  /** Every stored file with the time it was last written, in no particular order. */
  list(): AsyncIterable<StoredFile>;
}

export interface StoredFile {
  key: string;
  modifiedAt: Date;
}

/** Keys look like `team/owner/id`; anything else is refused before touching the disk. */
function checkKey(key: string): string {
  if (!/^[A-Za-z0-9_-]+(\/[A-Za-z0-9_-]+)*$/.test(key)) throw new Error(`Invalid storage key: ${key}`);
  return key;
}

export class LocalStorage implements FileStorage {
  readonly name = 'local' as const;
  constructor(private readonly root: string) {}

  private path(key: string): string {
    const full = resolve(this.root, checkKey(key));
    if (!full.startsWith(resolve(this.root) + sep)) throw new Error('Storage key escapes the upload folder');
    return full;
  }

  async put(key: string, bytes: Uint8Array): Promise<void> {
    const path = this.path(key);
    await mkdir(dirname(path), { recursive: true });
    await writeFile(path, bytes);
  }

  async get(key: string): Promise<Uint8Array | null> {
    try {
      return new Uint8Array(await readFile(this.path(key)));
    } catch (err) {
      if ((err as NodeJS.ErrnoException).code === 'ENOENT') return null;
      throw err;
    }
  }

  async delete(key: string): Promise<void> {
    await rm(this.path(key), { force: true });
  }

  async *list(): AsyncIterable<StoredFile> {
    yield* this.walk(resolve(this.root), '');
  }

  private async *walk(dir: string, prefix: string): AsyncIterable<StoredFile> {
    let entries;
    try {
      entries = await readdir(dir, { withFileTypes: true });
    } catch (err) {
      if ((err as NodeJS.ErrnoException).code === 'ENOENT') return;
      throw err;
    }
    for (const entry of entries) {
      const key = prefix ? `${prefix}/${entry.name}` : entry.name;
      if (entry.isDirectory()) yield* this.walk(join(dir, entry.name), key);
      else if (entry.isFile()) {
        const info = await stat(join(dir, entry.name)).catch(() => null);
        if (info) yield { key, modifiedAt: info.mtime };
      }
    }
  }
}

export class S3Storage implements FileStorage {
  readonly name = 's3' as const;
  private readonly client: S3Client;
  constructor(private readonly settings: S3Settings) {
    this.client = new S3Client({
      region: settings.region,
      endpoint: settings.endpoint,
      forcePathStyle: settings.forcePathStyle,
      credentials: settings.accessKeyId && settings.secretAccessKey ? { accessKeyId: settings.accessKeyId, secretAccessKey: settings.secretAccessKey } : undefined,
    });
  }

  async put(key: string, bytes: Uint8Array, contentType: string): Promise<void> {
    await this.client.send(new PutObjectCommand({ Bucket: this.settings.bucket, Key: checkKey(key), Body: bytes, ContentType: contentType }));
  }

  async get(key: string): Promise<Uint8Array | null> {
    try {
      const out = await this.client.send(new GetObjectCommand({ Bucket: this.settings.bucket, Key: checkKey(key) }));
      return out.Body ? await out.Body.transformToByteArray() : null;
    } catch (err) {
      const e = err as { name?: string; $metadata?: { httpStatusCode?: number } };
      if (e.name === 'NoSuchKey' || e.$metadata?.httpStatusCode === 404) return null;
      throw err;
    }
  }

  async delete(key: string): Promise<void> {
    await this.client.send(new DeleteObjectCommand({ Bucket: this.settings.bucket, Key: checkKey(key) }));
  }

  async *list(): AsyncIterable<StoredFile> {
    let token: string | undefined;
    do {
      const page = await this.client.send(new ListObjectsV2Command({ Bucket: this.settings.bucket, ContinuationToken: token }));
      for (const o of page.Contents ?? []) if (o.Key && o.LastModified) yield { key: o.Key, modifiedAt: o.LastModified };
      token = page.IsTruncated ? page.NextContinuationToken : undefined;
    } while (token);
  }
}

let instance: FileStorage | null = null;

/** The configured backend: S3 when S3_BUCKET is set, otherwise the local upload folder. */
export function storage(): FileStorage {
  instance ??= config.s3 ? new S3Storage(config.s3) : new LocalStorage(config.uploadDir);
  return instance;
}

