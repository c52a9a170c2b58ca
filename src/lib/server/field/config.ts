/** Settings of the field-work area, read from the environment (after the platform has loaded `.env`). */
import { resolve } from 'node:path';
import { baseUrl } from '../config';

export { baseUrl };

const DEFAULT_UPLOAD_MAX = 20 * 1024 * 1024;

function positiveInt(raw: string | undefined, fallback: number): number {
  const n = Number(raw);
  return Number.isInteger(n) && n > 0 ? n : fallback;
}

/** Largest accepted upload, bytes (UPLOAD_MAX_BYTES, default 20 MB). */
export const uploadMaxBytes = positiveInt(process.env.UPLOAD_MAX_BYTES, DEFAULT_UPLOAD_MAX);

/** Local folder for uploads when no S3 bucket is configured (UPLOAD_DIR, default data/uploads). */
export const uploadDir = resolve(process.env.UPLOAD_DIR || 'data/uploads');

export interface S3Settings {
  bucket: string;
  endpoint?: string;
  region: string;
  accessKeyId?: string;
  secretAccessKey?: string;
  forcePathStyle: boolean;
}

/** S3-compatible storage when S3_BUCKET is set; null means the local folder. */
export const s3Settings: S3Settings | null = process.env.S3_BUCKET
  ? {
      bucket: process.env.S3_BUCKET,
      endpoint: process.env.S3_ENDPOINT || undefined,
      region: process.env.S3_REGION || 'us-east-1',
      accessKeyId: process.env.S3_ACCESS_KEY_ID || undefined,
      secretAccessKey: process.env.S3_SECRET_ACCESS_KEY || undefined,
      forcePathStyle: ['1', 'true', 'yes'].includes((process.env.S3_FORCE_PATH_STYLE ?? '').toLowerCase()),
    }
  : null;

function seconds(raw: string | undefined, fallback: number): number {
  const n = Number(raw);
  return raw !== undefined && raw !== '' && Number.isFinite(n) && n >= 0 ? n : fallback;
}

/**
 * Sweeping stored files that no attachment row names (left by a crash between storing and recording):
 * how often, in seconds (UPLOAD_SWEEP_INTERVAL_SECONDS, default 6 hours; 0 = only at start), and how old a
 * file must be before it counts as left over (UPLOAD_SWEEP_GRACE_SECONDS, default 1 hour, so an upload in
 * flight is never taken).
 */
export const uploadSweep = {
  intervalSeconds: seconds(process.env.UPLOAD_SWEEP_INTERVAL_SECONDS, 6 * 3600),
  graceSeconds: seconds(process.env.UPLOAD_SWEEP_GRACE_SECONDS, 3600),
};

/** Default and longest lifetime of a share link, days. */
export const shareDefaultDays = positiveInt(process.env.SHARE_DEFAULT_DAYS, 30);
export const shareMaxDays = 365;
