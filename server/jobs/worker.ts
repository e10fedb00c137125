import PgBoss from 'pg-boss'
import type { Logger } from 'pino'
import type { Db } from '../db/client.ts'
import { deliverMail } from '../mail/outbox.ts'
import type { Mailer } from '../mail/mailer.ts'
import { processAuditRun } from '../services/audit-runs.ts'
import { processClubArchive } from '../services/club-archives.ts'
import { remindRecommendation, type ReminderJob } from '../services/recommendation-mail.ts'
import { closeReportPdfPool } from '../services/report-pdf-pool.ts'
import { processReportPdf } from '../services/report-pdfs.ts'
import type { ClipRemovalJob } from '../services/clips.ts'
import type { ClipStore } from '../storage/clip-store.ts'
import { createJobQueue, queueOptions, queues, type JobSettings, type QueueName } from './queue.ts'

export interface JobWorkerOptions {
  connectionString: string
  db: Db
  mailer: Mailer
  logger: Logger
  settings: JobSettings
  /**
   * Where clip videos are stored. A worker without one leaves the clip removals to workers that
   * have it (and they wait, should none have it).
   */
  clips?: ClipStore | null
}

export interface JobWorker {
  /** Looks for jobs of `queue` now rather than at the next poll. */
  wake(queue: QueueName): void
  /** Lets the jobs in hand finish (up to `timeoutMs`), then stops taking new ones. */
  stop(timeoutMs?: number): Promise<void>
}

/**
 * Takes jobs from the queues and does them: audits, club archives, PDF reports, reminders,
 * mail and the removal of clip videos. Any number of workers, in any number of processes, share the queues; a job whose worker
 * died is expired by the others' maintenance and retried.
 */
export async function startJobWorker(options: JobWorkerOptions): Promise<JobWorker> {
  const { db, mailer, logger, settings } = options
  const boss = new PgBoss({
    connectionString: options.connectionString,
    max: 3,
    migrate: false,
    supervise: true,
    schedule: false,
    maintenanceIntervalSeconds: settings.maintenanceSeconds,
  })
  boss.on('error', (err) => logger.warn({ err: err.message }, 'job queue'))
  await boss.start()
  const limits = queueOptions(settings)
  const workOptions = {
    batchSize: 1,
    includeMetadata: true as const,
    pollingIntervalSeconds: settings.pollSeconds,
  }
  const ids: Partial<Record<QueueName, string>> = {}
  // pg-boss waits out its polling interval after each job; a burst (forty PDFs asked for at
  // once, a round of mail) would drain at one job a second. Having just finished one, a worker
  // looks for the next at once, and waits only when it finds none.
  const next = (queue: QueueName) => {
    const id = ids[queue]
    if (id) boss.notifyWorker(id)
  }
  ids[queues.auditRun] = await boss.work<{ clubId: string; runId: string }>(
    queues.auditRun,
    workOptions,
    async ([job]) => {
      const lastAttempt = job!.retryCount >= (job!.retryLimit ?? limits[queues.auditRun].retryLimit)
      await processAuditRun(db, logger, { ...job!.data, lastAttempt })
    },
  )
  ids[queues.clubArchive] = await boss.work<{ clubId: string; archiveId: string }>(
    queues.clubArchive,
    workOptions,
    async ([job]) => {
      const lastAttempt =
        job!.retryCount >= (job!.retryLimit ?? limits[queues.clubArchive].retryLimit)
      await processClubArchive(db, logger, { ...job!.data, lastAttempt })
    },
  )
  ids[queues.reportPdf] = await boss.work<{ clubId: string; reportPdfId: string }>(
    queues.reportPdf,
    workOptions,
    async ([job]) => {
      const lastAttempt =
        job!.retryCount >= (job!.retryLimit ?? limits[queues.reportPdf].retryLimit)
      try {
        await processReportPdf(db, logger, { ...job!.data, lastAttempt })
      } finally {
        next(queues.reportPdf)
      }
    },
  )
  ids[queues.mail] = await boss.work<{ outboxId: string }>(
    queues.mail,
    workOptions,
    async ([job]) => {
      try {
        await deliverMail(db, mailer, job!.data.outboxId)
      } catch (err) {
        logger.warn(
          { err: (err as Error).message, attempt: job!.retryCount + 1 },
          'mail not sent yet',
        )
        throw err
      } finally {
        next(queues.mail)
      }
    },
  )
  const store = options.clips
  if (store) {
    ids[queues.clipRemoval] = await boss.work<ClipRemovalJob>(
      queues.clipRemoval,
      workOptions,
      async ([job]) => {
        try {
          await store.remove(job!.data.keys)
        } catch (err) {
          const lastAttempt =
            job!.retryCount >= (job!.retryLimit ?? limits[queues.clipRemoval].retryLimit)
          if (lastAttempt) {
            // Nothing retries after this: the keys, for someone to remove by hand.
            logger.error(
              { err: (err as Error).message, keys: job!.data.keys },
              'clip objects of erased rows left in storage',
            )
          } else {
            logger.warn(
              { err: (err as Error).message, attempt: job!.retryCount + 1 },
              'clip objects not deleted yet',
            )
          }
          throw err
        } finally {
          next(queues.clipRemoval)
        }
      },
    )
  }
  // Reminders put mail on the queue in their own transaction.
  const sender = createJobQueue(db, settings)
  sender.attachWorker(next)
  ids[queues.recommendationReminder] = await boss.work<ReminderJob>(
    queues.recommendationReminder,
    workOptions,
    async ([job]) => {
      try {
        await remindRecommendation(db, sender, job!.data)
      } finally {
        next(queues.recommendationReminder)
      }
    },
  )
  return {
    wake: next,
    async stop(timeoutMs = 10_000) {
      await boss.stop({ graceful: true, timeout: timeoutMs, wait: true })
      await closeReportPdfPool()
    },
  }
}
