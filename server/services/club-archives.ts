import { and, eq } from 'drizzle-orm'
import type { Logger } from 'pino'
import { todayIso } from '../../shared/domain/access.ts'
import type { ClubArchiveJob } from '../../shared/schemas/archives.ts'
import type { ClubAccess } from '../auth/club-access.ts'
import type { Db } from '../db/client.ts'
import { clubs } from '../db/schema-accounts.ts'
import { clubArchiveFiles, clubArchives } from '../db/schema-audits.ts'
import { AppError, notFound } from '../http/errors.ts'
import { queues, type JobQueue } from '../jobs/queue.ts'
import { buildClubArchive, type ArchiveProgress } from './archive-zip.ts'

type ArchiveRow = typeof clubArchives.$inferSelect

/** How long a finished archive can be downloaded. */
export const archiveLifetimeMs = 24 * 60 * 60 * 1000

/** Shown when an archive fails for a reason that is not the person's to fix. */
const failedMessage = 'The archive could not be made. Try again; if it fails again, tell us.'

const view = (row: ArchiveRow, now = new Date()): ClubArchiveJob => ({
  id: row.id,
  status: row.status === 'done' && row.expiresAt <= now ? 'expired' : row.status,
  phase: row.phase,
  done: row.done,
  total: row.total,
  error: row.error,
  createdAt: row.createdAt.toISOString(),
  expiresAt: row.expiresAt.toISOString(),
  bytes: row.byteSize,
  sha256: row.sha256,
})

const whereArchive = (clubId: string, id: string) =>
  and(eq(clubArchives.clubId, clubId), eq(clubArchives.id, id))

/**
 * Asks for an archive of everything the club holds: stores its row and sends its job in one
 * transaction. A worker builds it; any web process answers a poll.
 */
export async function submitClubArchive(
  db: Db,
  jobs: JobQueue,
  access: ClubAccess,
): Promise<ClubArchiveJob> {
  return db.transaction(async (tx) => {
    const [row] = await tx
      .insert(clubArchives)
      .values({
        clubId: access.clubId,
        requestedBy: access.userId,
        expiresAt: new Date(Date.now() + archiveLifetimeMs),
      })
      .returning()
    const jobId = await jobs.send(tx, queues.clubArchive, {
      clubId: access.clubId,
      archiveId: row!.id,
    })
    await tx.update(clubArchives).set({ jobId }).where(whereArchive(access.clubId, row!.id))
    return view(row!)
  })
}

/** An archive of this club, as a poll sees it; one whose job gave up reads as failed. */
export async function getClubArchive(db: Db, jobs: JobQueue, clubId: string, id: string) {
  const [row] = await db.select().from(clubArchives).where(whereArchive(clubId, id))
  if (!row) throw notFound('No such archive.')
  if (row.status === 'running' && row.jobId) {
    if (await jobs.gaveUp(queues.clubArchive, row.jobId)) {
      return view({ ...row, status: 'failed', error: failedMessage })
    }
  }
  return view(row)
}

/**
 * The zip of a finished archive and the name to save it under (`<club-slug>-<date>.zip`).
 * 410 once it has expired, 409 while it is still being made or when it failed.
 */
export async function clubArchiveDownload(db: Db, clubId: string, id: string, now = new Date()) {
  const [row] = await db
    .select({
      status: clubArchives.status,
      createdAt: clubArchives.createdAt,
      expiresAt: clubArchives.expiresAt,
      slug: clubs.slug,
    })
    .from(clubArchives)
    .innerJoin(clubs, eq(clubs.id, clubArchives.clubId))
    .where(whereArchive(clubId, id))
  if (!row) throw notFound('No such archive.')
  if (row.expiresAt <= now) {
    throw new AppError(
      410,
      'archive_expired',
      'This archive has expired: archives are kept for 24 hours. Make a new one.',
    )
  }
  if (row.status !== 'done') {
    throw new AppError(409, 'archive_not_ready', 'This archive is not ready to download.')
  }
  const [file] = await db
    .select({ bytes: clubArchiveFiles.bytes })
    .from(clubArchiveFiles)
    .where(and(eq(clubArchiveFiles.clubId, clubId), eq(clubArchiveFiles.archiveId, id)))
  if (!file) throw notFound('No such archive.')
  return { filename: `${row.slug}-${todayIso(row.createdAt)}.zip`, bytes: file.bytes }
}

/**
 * A worker's part: builds the archive and stores it. The store locks the archive's row, so an
 * archive taken over from a worker that died is stored once, never twice. A failure is thrown
 * for the queue to retry, and recorded as failed on the last attempt.
 */
export async function processClubArchive(
  db: Db,
  logger: Logger,
  job: { clubId: string; archiveId: string; lastAttempt: boolean },
  options: { pageSize?: number } = {},
) {
  const where = whereArchive(job.clubId, job.archiveId)
  const [row] = await db.select().from(clubArchives).where(where)
  if (!row || row.status !== 'running') return
  // Progress is written now and then, not at every page, and in order.
  let written = Promise.resolve()
  let lastWrite = 0
  let lastPhase = ''
  const onProgress = (p: ArchiveProgress) => {
    const now = Date.now()
    if (p.phase === lastPhase && now - lastWrite < 250) return
    lastWrite = now
    lastPhase = p.phase
    written = written
      .then(() =>
        db
          .update(clubArchives)
          .set(p)
          .where(and(where, eq(clubArchives.status, 'running'))),
      )
      .then(() => undefined)
      .catch(() => undefined)
  }
  try {
    const built = await buildClubArchive(db, job.clubId, {
      pageSize: options.pageSize,
      onProgress,
      createdAt: row.createdAt,
    })
    await written
    await db.transaction(async (tx) => {
      const [current] = await tx.select().from(clubArchives).where(where).for('update')
      if (!current || current.status !== 'running') return
      await tx
        .insert(clubArchiveFiles)
        .values({ clubId: job.clubId, archiveId: job.archiveId, bytes: built.bytes })
      const finishedAt = new Date()
      await tx
        .update(clubArchives)
        .set({
          status: 'done',
          phase: 'done',
          done: built.total,
          total: built.total,
          byteSize: built.bytes.length,
          sha256: built.sha256,
          finishedAt,
          expiresAt: new Date(finishedAt.getTime() + archiveLifetimeMs),
        })
        .where(where)
    })
  } catch (err) {
    await written
    if (!job.lastAttempt) throw err
    logger.error({ err, archiveId: job.archiveId }, 'club archive failed')
    await db
      .update(clubArchives)
      .set({ status: 'failed', error: failedMessage, finishedAt: new Date() })
      .where(and(where, eq(clubArchives.status, 'running')))
  }
}
