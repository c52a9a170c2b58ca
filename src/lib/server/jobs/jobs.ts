/**
 * Long jobs: checked and staged in short batches that yield to other requests, then applied in one short
 * final transaction, all rows or none (docs/decisions/008-long-jobs-in-batches.md). Each job's progress
 * is a row in `job`, so any app server can report it.
 */
import { and, desc, eq, inArray, lt, sql } from 'drizzle-orm';
import { db, type Tx } from '../../../db/client';
import { job, type JobKind } from '../../../db/schema';
import type { TeamContext } from '../guard';
import { AppError } from '../errors';
import { newId } from '../ids';
import { clearStaged, discardJob, finishAfterCommit, jobsWithHiddenRecords, Stage } from './stage';

/** A running job touches its row with every batch; one silent for this long was interrupted. */
export const ABANDONED_AFTER_MS = 10 * 60_000;
/** Finished jobs are listed for a week. */
const KEPT_MS = 7 * 24 * 3600_000;
/** Progress of the checking phase is written at most this often. */
const PROGRESS_EVERY_MS = 250;

export interface JobView {
  id: string;
  kind: JobKind;
  state: (typeof job.$inferSelect)['state'];
  done: number;
  total: number;
  message: string;
  userName: string;
  createdAt: string;
  updatedAt: string;
  finishedAt: string | null;
}

export interface StagedJob<T> {
  /** Reads, checks and stages the rows (`stage.add`), reporting progress; throws to refuse. */
  stage(stage: Stage, progress: Progress): Promise<void>;
  /** In the final transaction, before the rows go in: checks what may have changed since (throws to refuse). */
  verify(tx: Tx): Promise<void>;
  /** The reply once the rows are in. */
  result(): T;
}

/** Records progress (work done of total, in the job's own units); never rejects. */
export interface Progress {
  (done: number, total: number): Promise<void>;
}

/**
 * Runs a staged job to the end and answers its result, so a request can simply await it. A failed job keeps its
 * message and leaves nothing behind; a committed one records its history before the request is answered.
 */
export async function runStagedJob<T>(ctx: TeamContext, kind: JobKind, work: StagedJob<T>): Promise<T> {
  await sweepAbandoned();
  const id = newId('job');
  await db.insert(job).values({ id, teamId: ctx.team.id, userId: ctx.user.id, userName: ctx.user.name, kind, state: 'checking' });
  const stage = new Stage(id, ctx.user.id);
  let written = 0;
  const progress: Progress = async (done, total) => {
    stage.report(done, total);
    if (Date.now() - written < PROGRESS_EVERY_MS) return;
    written = Date.now();
    // Progress is a report only: a failed write of it must not stop the job (nor go unhandled).
    await db.update(job).set({ done, total, updatedAt: new Date() }).where(eq(job.id, id)).catch(() => undefined);
  };
  try {
    await work.stage(stage, progress);
    await stage.flush();
    await db.update(job).set({ state: 'applying', updatedAt: new Date() }).where(eq(job.id, id));
    await db.transaction(async (tx) => {
      try {
        await work.verify(tx);
        await stage.apply(tx);
        await tx.update(job).set({ state: 'done', updatedAt: new Date(), finishedAt: new Date() }).where(eq(job.id, id));
      } finally {
        await stage.restoreCache(tx);
      }
    });
  } catch (err) {
    const message = err instanceof AppError ? err.message : 'The job stopped on an unexpected error; nothing was written.';
    await db.update(job).set({ state: 'failed', message, updatedAt: new Date(), finishedAt: new Date() }).where(eq(job.id, id));
    await stage.discard();
    throw err;
  }
  // Committed: the records are in, with their history. What is left in the stage goes; should this stop (the
  // server going down), the next sweep clears it.
  await stage.afterCommit().catch((err) => console.error(`job ${id}: stage not yet cleared, the next sweep clears it:`, err));
  return work.result();
}

/**
 * Interrupted jobs (their server stopped) are marked failed and what they wrote is removed; a job that committed
 * but had not yet recorded its history records it; finished jobs older than a week are forgotten. Runs before
 * each new job and at start-up.
 */
export async function sweepAbandoned(now = Date.now()): Promise<void> {
  const stale = await db.select({ id: job.id }).from(job)
    .where(and(inArray(job.state, ['checking', 'applying']), lt(job.updatedAt, new Date(now - ABANDONED_AFTER_MS))));
  for (const { id } of stale) {
    await db.update(job).set({ state: 'failed', message: 'Interrupted (the server stopped); nothing was written.', finishedAt: new Date(now) }).where(eq(job.id, id));
    await discardJob(id);
  }
  const running = sql`SELECT id FROM job WHERE state IN ('checking', 'applying')`;
  const orphans = await db.all<{ jobId: string; state: string | null }>(sql`SELECT s.job_id AS jobId, j.state FROM (SELECT DISTINCT job_id FROM job_row WHERE job_id NOT IN (${running})) s LEFT JOIN job j ON j.id = s.job_id`);
  for (const { jobId, state } of orphans) await (state === 'done' ? finishAfterCommit(jobId) : clearStaged(jobId));
  const unfinished = new Set((await db.all<{ id: string }>(running)).map((r) => r.id));
  for (const jobId of await jobsWithHiddenRecords()) if (!unfinished.has(jobId)) await discardJob(jobId);
  // A failed job's history is hidden by its row: what a clean-up cut short left of it goes before the row does.
  const old = lt(job.createdAt, new Date(now - KEPT_MS));
  const forgotten = await db.select({ id: job.id }).from(job).where(and(eq(job.state, 'failed'), old));
  for (const { id } of forgotten) await discardJob(id);
  await db.delete(job).where(and(inArray(job.state, ['done', 'failed']), old));
}

/** The team's jobs, newest first. */
export async function listJobs(ctx: TeamContext, limit = 20): Promise<{ items: JobView[] }> {
  const rows = await db.select().from(job).where(eq(job.teamId, ctx.team.id)).orderBy(desc(job.createdAt), desc(job.id)).limit(limit);
  return {
    items: rows.map((r) => ({
      id: r.id, kind: r.kind, state: r.state, done: r.done, total: r.total, message: r.message, userName: r.userName,
      createdAt: r.createdAt.toISOString(), updatedAt: r.updatedAt.toISOString(), finishedAt: r.finishedAt?.toISOString() ?? null,
    })),
  };
}
