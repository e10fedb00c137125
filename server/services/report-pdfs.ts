import { and, desc, eq, gt, isNull, or, sql } from 'drizzle-orm'
import type { Logger } from 'pino'
import type { ReportPdfJob } from '../../shared/schemas/report-pdfs.ts'
import type { ClubAccess } from '../auth/club-access.ts'
import type { Db, DbOrTx } from '../db/client.ts'
import { clubs } from '../db/schema-accounts.ts'
import { audits, reportPdfFiles, reportPdfs } from '../db/schema-audits.ts'
import { AppError, notFound } from '../http/errors.ts'
import { queues, type JobQueue } from '../jobs/queue.ts'
import { reportWithin } from './audits.ts'
import { drawReportPdf } from './report-pdf-pool.ts'
import { readableSquadIds } from './scope.ts'

type ReportPdfRow = typeof reportPdfs.$inferSelect

/** How long a drawn PDF can be downloaded. */
export const reportPdfLifetimeMs = 60 * 60 * 1000

/**
 * How long a drawn PDF is handed out again to the same person asking for the same report,
 * instead of drawing it anew: long enough for a second click or a second tab, short enough that
 * a name corrected since shows on the next ask.
 */
export const reportPdfReuseMs = 5 * 60 * 1000

/** Shown when a PDF fails for a reason that is not the person's to fix. */
const failedMessage = 'The PDF report could not be made. Try again; if it fails again, tell us.'

const noSuchPdf = () => notFound('No such PDF report.')

const view = (row: ReportPdfRow, now = new Date()): ReportPdfJob => ({
  id: row.id,
  auditId: row.auditId,
  status: row.status === 'done' && row.expiresAt <= now ? 'expired' : row.status,
  phase: row.phase,
  done: row.done,
  total: row.total,
  error: row.error,
  createdAt: row.createdAt.toISOString(),
  expiresAt: row.expiresAt.toISOString(),
  bytes: row.byteSize,
})

const wherePdf = (clubId: string, id: string) =>
  and(eq(reportPdfs.clubId, clubId), eq(reportPdfs.id, id))

/** The squads a person reads, as stored with their PDF: null for every squad, else sorted ids. */
async function squadReach(db: DbOrTx, access: ClubAccess) {
  const readable = await readableSquadIds(db, access)
  return readable === 'all' ? null : [...readable].sort()
}

const sameReach = (a: string[] | null, b: string[] | null) =>
  JSON.stringify(a) === JSON.stringify(b)

/** A render of this person's that the same ask may have again: in hand, or fresh and unchanged. */
async function reusable(
  tx: DbOrTx,
  jobs: JobQueue,
  access: ClubAccess,
  auditId: string,
  squadIds: string[] | null,
) {
  const now = new Date()
  // A new or newly published audit changes the trend and the comparison the PDF draws.
  const lastAuditChange = sql`coalesce((select max(greatest(${audits.createdAt}, ${audits.publishedAt})) from ${audits} where ${audits.clubId} = ${access.clubId}), '-infinity'::timestamptz)`
  const [row] = await tx
    .select()
    .from(reportPdfs)
    .where(
      and(
        eq(reportPdfs.clubId, access.clubId),
        eq(reportPdfs.auditId, auditId),
        eq(reportPdfs.requestedBy, access.userId),
        squadIds === null
          ? isNull(reportPdfs.squadIds)
          : sql`${reportPdfs.squadIds} = ${JSON.stringify(squadIds)}::jsonb`,
        sql`${reportPdfs.createdAt} >= ${lastAuditChange}`,
        or(
          eq(reportPdfs.status, 'running'),
          and(
            eq(reportPdfs.status, 'done'),
            gt(reportPdfs.finishedAt, new Date(now.getTime() - reportPdfReuseMs)),
            gt(reportPdfs.expiresAt, now),
          ),
        ),
      ),
    )
    .orderBy(desc(reportPdfs.createdAt))
    .limit(1)
  if (row?.status === 'running' && row.jobId) {
    if (await jobs.gaveUp(queues.reportPdf, row.jobId)) return undefined
  }
  return row
}

/**
 * Asks for the PDF report of an audit, drawn for what the person reads. The same ask while one
 * is being drawn, or soon after, answers that one; else stores a new row and sends its job in
 * one transaction. A worker draws it; any web process answers a poll.
 */
export async function submitReportPdf(
  db: Db,
  jobs: JobQueue,
  access: ClubAccess,
  auditId: string,
): Promise<ReportPdfJob> {
  const [audit] = await db
    .select({ id: audits.id })
    .from(audits)
    .where(and(eq(audits.clubId, access.clubId), eq(audits.id, auditId)))
  if (!audit) throw notFound('No such audit.')
  const squadIds = await squadReach(db, access)
  return db.transaction(async (tx) => {
    // Two asks at once take turns here, so the second finds the first's row.
    const key = `report-pdf:${access.clubId}:${auditId}:${access.userId}`
    await tx.execute(sql`select pg_advisory_xact_lock(hashtextextended(${key}, 0))`)
    const existing = await reusable(tx, jobs, access, auditId, squadIds)
    if (existing) return view(existing)
    const [row] = await tx
      .insert(reportPdfs)
      .values({
        clubId: access.clubId,
        auditId,
        requestedBy: access.userId,
        squadIds,
        expiresAt: new Date(Date.now() + reportPdfLifetimeMs),
      })
      .returning()
    const jobId = await jobs.send(tx, queues.reportPdf, {
      clubId: access.clubId,
      reportPdfId: row!.id,
    })
    await tx.update(reportPdfs).set({ jobId }).where(wherePdf(access.clubId, row!.id))
    return view(row!)
  })
}

/**
 * A job gives up only after its retries, seconds after it was sent; until then a poll need not
 * ask the queue, and the many polls of a burst cost one query each.
 */
const givingUpAfterMs = 5_000

/** One's own PDF report, as a poll sees it; one whose job gave up reads as failed. */
export async function getReportPdf(db: Db, jobs: JobQueue, access: ClubAccess, id: string) {
  const [row] = await db
    .select()
    .from(reportPdfs)
    .where(and(wherePdf(access.clubId, id), eq(reportPdfs.requestedBy, access.userId)))
  if (!row) throw noSuchPdf()
  const old = Date.now() - row.createdAt.getTime() > givingUpAfterMs
  if (row.status === 'running' && row.jobId && old) {
    if (await jobs.gaveUp(queues.reportPdf, row.jobId)) {
      return view({ ...row, status: 'failed', error: failedMessage })
    }
  }
  return view(row)
}

/**
 * The bytes of one's own drawn PDF report and the name to save it under (`audit-<as of>.pdf`).
 * 410 once it has expired or the person's squads have changed since; 409 while it is being
 * drawn or when it failed.
 */
export async function reportPdfDownload(db: Db, access: ClubAccess, id: string, now = new Date()) {
  const [row] = await db
    .select({
      status: reportPdfs.status,
      expiresAt: reportPdfs.expiresAt,
      squadIds: reportPdfs.squadIds,
      asOf: audits.asOf,
    })
    .from(reportPdfs)
    .innerJoin(audits, and(eq(audits.clubId, reportPdfs.clubId), eq(audits.id, reportPdfs.auditId)))
    .where(and(wherePdf(access.clubId, id), eq(reportPdfs.requestedBy, access.userId)))
  if (!row) throw noSuchPdf()
  if (row.expiresAt <= now) {
    throw new AppError(
      410,
      'report_pdf_expired',
      'This PDF report has expired: PDF reports are kept for an hour. Prepare a new one.',
    )
  }
  if (!sameReach(row.squadIds, await squadReach(db, access))) {
    throw new AppError(
      410,
      'report_pdf_expired',
      'Your squads have changed since this PDF report was prepared. Prepare a new one.',
    )
  }
  if (row.status !== 'done') {
    throw new AppError(409, 'report_pdf_not_ready', 'This PDF report is not ready to download.')
  }
  const [file] = await db
    .select({ bytes: reportPdfFiles.bytes })
    .from(reportPdfFiles)
    .where(and(eq(reportPdfFiles.clubId, access.clubId), eq(reportPdfFiles.reportPdfId, id)))
  if (!file) throw noSuchPdf()
  return { filename: `audit-${row.asOf}.pdf`, bytes: file.bytes }
}

/**
 * A worker's part: reads the report as the person who asked could, draws it and stores it. The
 * store locks the row, so a PDF taken over from a worker that died is stored once. A refusal
 * (the audit is gone) fails it with its message; anything else is thrown for the queue to retry,
 * and recorded as failed on the last attempt.
 */
export async function processReportPdf(
  db: Db,
  logger: Logger,
  job: { clubId: string; reportPdfId: string; lastAttempt: boolean },
) {
  const where = wherePdf(job.clubId, job.reportPdfId)
  const [row] = await db.select().from(reportPdfs).where(where)
  if (!row || row.status !== 'running') return
  const running = and(where, eq(reportPdfs.status, 'running'))
  const fail = (error: string) =>
    db.update(reportPdfs).set({ status: 'failed', error, finishedAt: new Date() }).where(running)
  try {
    await db.update(reportPdfs).set({ phase: 'report', done: 0 }).where(running)
    const report = await reportWithin(db, job.clubId, row.auditId, row.squadIds ?? 'all')
    const [club] = await db.select({ name: clubs.name }).from(clubs).where(eq(clubs.id, job.clubId))
    await db.update(reportPdfs).set({ phase: 'drawing', done: 1 }).where(running)
    const pdf = await drawReportPdf(report, club!.name)
    await db.transaction(async (tx) => {
      const [current] = await tx.select().from(reportPdfs).where(where).for('update')
      if (!current || current.status !== 'running') return
      await tx
        .insert(reportPdfFiles)
        .values({ clubId: job.clubId, reportPdfId: job.reportPdfId, bytes: pdf })
      const finishedAt = new Date()
      await tx
        .update(reportPdfs)
        .set({
          status: 'done',
          phase: 'done',
          done: current.total,
          byteSize: pdf.length,
          finishedAt,
          expiresAt: new Date(finishedAt.getTime() + reportPdfLifetimeMs),
        })
        .where(where)
    })
  } catch (err) {
    if (err instanceof AppError && err.status < 500) return void (await fail(err.message))
    if (!job.lastAttempt) throw err
    logger.error({ err, reportPdfId: job.reportPdfId }, 'PDF report failed')
    await fail(failedMessage)
  }
}
