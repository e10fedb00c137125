import { and, eq } from 'drizzle-orm'
import type { Logger } from 'pino'
import type { AuditJob, AuditRun } from '../../shared/schemas/audits.ts'
import type { ClubAccess } from '../auth/club-access.ts'
import type { Db } from '../db/client.ts'
import { auditRuns, audits } from '../db/schema-audits.ts'
import { AppError, notFound } from '../http/errors.ts'
import { queues, type JobQueue } from '../jobs/queue.ts'
import { checkRun, computeAudit } from './audits.ts'

type RunRow = typeof auditRuns.$inferSelect

const view = (row: RunRow): AuditJob => ({
  id: row.id,
  status: row.status,
  phase: row.phase,
  done: row.done,
  total: row.total,
  auditId: row.auditId,
  error: row.error,
})

/** Shown when an audit fails for a reason that is not the person's to fix. */
const failedMessage = 'The audit could not be computed. Try again; if it fails again, tell us.'

/**
 * Asks for an audit: checks the run (its date, its squad) before answering, then stores the run
 * and sends its job in one transaction. A worker computes it; any web process answers a poll.
 */
export async function submitAuditRun(
  db: Db,
  jobs: JobQueue,
  access: ClubAccess,
  run: AuditRun,
): Promise<AuditJob> {
  await checkRun(db, access, run)
  return db.transaction(async (tx) => {
    const [row] = await tx
      .insert(auditRuns)
      .values({
        clubId: access.clubId,
        run,
        requestedBy: access.userId,
        requesterRole: access.role,
      })
      .returning()
    const jobId = await jobs.send(tx, queues.auditRun, { clubId: access.clubId, runId: row!.id })
    await tx
      .update(auditRuns)
      .set({ jobId })
      .where(and(eq(auditRuns.clubId, access.clubId), eq(auditRuns.id, row!.id)))
    return view(row!)
  })
}

/** A run of this club, as a poll sees it; a run whose job gave up reads as failed. */
export async function getAuditRun(db: Db, jobs: JobQueue, clubId: string, id: string) {
  const [row] = await db
    .select()
    .from(auditRuns)
    .where(and(eq(auditRuns.clubId, clubId), eq(auditRuns.id, id)))
  if (!row) throw notFound('No such audit run.')
  if (row.status === 'running' && row.jobId) {
    if (await jobs.gaveUp(queues.auditRun, row.jobId)) {
      return view({ ...row, status: 'failed', error: failedMessage })
    }
  }
  return view(row)
}

/** Resolves once the run has finished (tests; the server's own checks). */
export async function settledAuditRun(db: Db, jobs: JobQueue, clubId: string, id: string) {
  for (;;) {
    const run = await getAuditRun(db, jobs, clubId, id)
    if (run.status !== 'running') return run
    await new Promise((r) => setTimeout(r, 50))
  }
}

/**
 * A worker's part: computes the run and stores its audit. The store locks the run's row, so a
 * run taken over from a worker that died is stored once, never twice. A run refused on its
 * inputs (its squad gone) fails with that reason; anything else is thrown for the queue to retry,
 * and recorded as failed on the last attempt.
 */
export async function processAuditRun(
  db: Db,
  logger: Logger,
  job: { clubId: string; runId: string; lastAttempt: boolean },
) {
  const where = and(eq(auditRuns.clubId, job.clubId), eq(auditRuns.id, job.runId))
  const [row] = await db.select().from(auditRuns).where(where)
  if (!row || row.status !== 'running') return
  const access: ClubAccess = {
    clubId: row.clubId,
    userId: row.requestedBy ?? '',
    role: row.requesterRole,
  }
  // Progress is written now and then, not at every athlete, and in order.
  let written = Promise.resolve()
  let lastWrite = 0
  let lastPhase = ''
  const onProgress = (p: { phase: string; done: number; total: number }) => {
    const now = Date.now()
    if (p.phase === lastPhase && now - lastWrite < 250) return
    lastWrite = now
    lastPhase = p.phase
    written = written
      .then(() => db.update(auditRuns).set(p).where(where))
      .then(() => undefined)
      .catch(() => undefined)
  }
  try {
    const values = await computeAudit(db, access, row.run, onProgress)
    await written
    await db.transaction(async (tx) => {
      const [current] = await tx.select().from(auditRuns).where(where).for('update')
      if (!current || current.status !== 'running') return
      const [audit] = await tx.insert(audits).values(values).returning({ id: audits.id })
      await tx
        .update(auditRuns)
        .set({
          status: 'done',
          phase: 'done',
          done: 1,
          total: 1,
          auditId: audit!.id,
          finishedAt: new Date(),
        })
        .where(where)
    })
  } catch (err) {
    await written
    const refused = err instanceof AppError && err.status < 500
    if (!refused && !job.lastAttempt) throw err
    logger.error({ err, runId: job.runId }, 'audit failed')
    await db
      .update(auditRuns)
      .set({
        status: 'failed',
        error: refused ? (err as AppError).message : failedMessage,
        finishedAt: new Date(),
      })
      .where(and(where, eq(auditRuns.status, 'running')))
  }
}
