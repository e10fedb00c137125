import PgBoss from 'pg-boss'
import type { Logger } from 'pino'
import type { Db } from '../db/client.ts'
import { deliverMail } from '../mail/outbox.ts'
import type { Mailer } from '../mail/mailer.ts'
import { processAuditRun } from '../services/audit-runs.ts'
import { processClubArchive } from '../services/club-archives.ts'
import { remindRecommendation, type ReminderJob } from '../services/recommendation-mail.ts'
import { createJobQueue, queueOptions, queues, type JobSettings, type QueueName } from './queue.ts'

export interface JobWorkerOptions {
  connectionString: string
  db: Db
  mailer: Mailer
  logger: Logger
  settings: JobSettings
}

export interface JobWorker {
  /** Looks for jobs of `queue` now rather than at the next poll. */
  wake(queue: QueueName): void
  /** Lets the jobs in hand finish (up to `timeoutMs`), then stops taking new ones. */
  stop(timeoutMs?: number): Promise<void>
}

/**
 * Takes jobs from the queues and does them: audits, club archives, reminders and mail. Any number of workers, in any
 * number of processes, share the queues; a job whose worker died is expired by the others'
 * maintenance and retried.
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
      }
    },
  )
  // Reminders put mail on the queue in their own transaction.
  const sender = createJobQueue(db, settings)
  sender.attachWorker((queue) => {
    const id = ids[queue]
    if (id) boss.notifyWorker(id)
  })
  ids[queues.recommendationReminder] = await boss.work<ReminderJob>(
    queues.recommendationReminder,
    workOptions,
    async ([job]) => {
      await remindRecommendation(db, sender, job!.data)
    },
  )
  return {
    wake(queue) {
      const id = ids[queue]
      if (id) boss.notifyWorker(id)
    },
    stop: (timeoutMs = 10_000) => boss.stop({ graceful: true, timeout: timeoutMs, wait: true }),
  }
}
