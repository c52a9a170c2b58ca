/**
 * Removes stored files that no attachment row names: an upload stores its bytes first and records the
 * row after, so a crash in between (or a purge whose clean-up failed) leaves a file nothing can reach.
 * Runs at start-up and then on a schedule; only files older than a grace period are touched, so an
 * upload in flight keeps its file.
 */
import { inArray } from 'drizzle-orm';
import { db } from '../../../db/client';
import { attachment } from '../../../db/schema';
import { storage, type FileStorage, type StoredFile } from './storage';
import { config } from '../../../config';

/** The keys attachments are stored under (`team_…/att_…`); anything else in the storage is left alone. */
const ATTACHMENT_KEY = /^team_[A-Za-z0-9_-]+\/(att_[A-Za-z0-9_-]+)$/;
const BATCH = 200;

/** Deletes the files older than `graceMs` that no attachment row names; answers their keys. */
export async function sweepOrphanFiles(graceMs: number, store: FileStorage = storage(), now = Date.now()): Promise<string[]> {
  const removed: string[] = [];
  let batch: StoredFile[] = [];
  const flush = async () => {
    const ids = batch.map((f) => ATTACHMENT_KEY.exec(f.key)![1]!);
    const rows = await db.select({ key: attachment.storageKey }).from(attachment).where(inArray(attachment.id, ids));
    const known = new Set(rows.map((r) => r.key));
    for (const f of batch) {
      if (known.has(f.key)) continue;
      await store.delete(f.key);
      removed.push(f.key);
    }
    batch = [];
  };
  for await (const file of store.list()) {
    if (!ATTACHMENT_KEY.test(file.key) || now - file.modifiedAt.getTime() < graceMs) continue;
    batch.push(file);
    if (batch.length >= BATCH) await flush();
  }
  if (batch.length) await flush();
  return removed;
}

let started = false;
let running: Promise<void> | null = null;

function sweepOnce(): Promise<void> {
  running ??= sweepOrphanFiles(config.uploadSweep.graceSeconds * 1000)
    .then((keys) => {
      if (keys.length) console.info(`Removed ${keys.length} stored file(s) without an attachment record.`);
    })
    .catch((err) => console.error('Sweeping stored files without an attachment record failed:', err))
    .finally(() => {
      running = null;
    });
  return running;
}

/** Sweeps now (in the background) and every `UPLOAD_SWEEP_INTERVAL_SECONDS`; once per process. */
export function startOrphanSweep(): void {
  if (started) return;
  started = true;
  void sweepOnce();
  if (config.uploadSweep.intervalSeconds > 0) setInterval(() => void sweepOnce(), config.uploadSweep.intervalSeconds * 1000).unref();
}
