import PgBoss from 'pg-boss'
import { sql, type SQL } from 'drizzle-orm'
import type { DbOrTx } from '../db/client.ts'
import { AppError } from '../http/errors.ts'

/** The queues of Twofold's background work. */
export const queues = {
  auditRun: 'audit-run',
  mail: 'mail',
  clubArchive: 'club-archive',
  recommendationReminder: 'recommendation-reminder',
  reportPdf: 'report-pdf',
  clipRemoval: 'clip-removal',
} as const
export type QueueName = (typeof queues)[keyof typeof queues]

export interface JobSettings {
  /** How long an audit may run before another worker takes it over (its worker died). */
  auditTimeoutSeconds: number
  /** How often a worker looks for new jobs when it is not woken. */
  pollSeconds: number
  /** How often a worker expires the jobs of dead workers and retries them. */
  maintenanceSeconds: number
}

export const defaultJobSettings: JobSettings = {
  auditTimeoutSeconds: 300,
  pollSeconds: 1,
  maintenanceSeconds: 30,
}

/**
 * How long a club archive may be built before another worker takes it over: a club of 1,000
 * athletes with 400,000 events is written in well under a minute, so this is a wide margin.
 */
export const archiveTimeoutSeconds = 30 * 60

/**
 * How long drawing a PDF report may take before another worker takes it over: the demo club's
 * takes about 0.2 s of CPU and a large club's a few seconds, so this is a wide margin.
 */
export const reportPdfTimeoutSeconds = 120

/**
 * How long a mail job may run before another worker takes it over: three times the longest a
 * send may take (`mailSendLimitMs`, server/mail/mailer.ts), so that it never happens while the
 * first send still runs.
 */
export const mailJobExpirySeconds = 135

/**
 * Retries with back-off: an audit, an archive or a PDF report a few times; mail for about three
 * to six days while SMTP is down (pg-boss waits retryDelay × 2^n × 1 to 2 seconds before retry
 * n, n from 0: 14 retries from 15 s add up to 2.8 to 5.7 days, 4.3 on average).
 */
export function queueOptions(settings: JobSettings) {
  return {
    [queues.auditRun]: {
      retryLimit: 3,
      retryDelay: 5,
      retryBackoff: true,
      expireInSeconds: settings.auditTimeoutSeconds,
    },
    [queues.mail]: {
      retryLimit: 14,
      retryDelay: 15,
      retryBackoff: true,
      expireInSeconds: mailJobExpirySeconds,
    },
    [queues.clubArchive]: {
      retryLimit: 2,
      retryDelay: 10,
      retryBackoff: true,
      expireInSeconds: archiveTimeoutSeconds,
    },
    [queues.recommendationReminder]: {
      retryLimit: 5,
      retryDelay: 60,
      retryBackoff: true,
      expireInSeconds: 60,
    },
    [queues.reportPdf]: {
      retryLimit: 2,
      retryDelay: 2,
      retryBackoff: true,
      expireInSeconds: reportPdfTimeoutSeconds,
    },
    // Clip videos of an erased athlete or a deleted club: retried while the object store is
    // unreachable, for 2.8 to 5.7 days (as mail: 12 retries from 60 s).
    [queues.clipRemoval]: {
      retryLimit: 12,
      retryDelay: 60,
      retryBackoff: true,
      expireInSeconds: 300,
    },
  } satisfies Record<QueueName, PgBoss.Queue extends infer Q ? Omit<Q, 'name'> : never>
}

/**
 * pg-boss's way to run its SQL, over a Drizzle handle or an open transaction: a job sent through
 * it is committed, or rolled back, with the change that caused it.
 */
export function jobExecutor(db: DbOrTx): PgBoss.Db {
  return {
    async executeSql(text: string, values: unknown[] = []) {
      const chunks: SQL[] = []
      let last = 0
      for (const match of text.matchAll(/\$(\d+)/g)) {
        chunks.push(sql.raw(text.slice(last, match.index)))
        chunks.push(sql`${values[Number(match[1]) - 1] ?? null}`)
        last = match.index + match[0].length
      }
      chunks.push(sql.raw(text.slice(last)))
      const result = await db.execute(sql.join(chunks))
      return { rows: result.rows }
    },
  }
}

/**
 * Sends jobs from a web process. The sending instance is never started: it only writes job rows,
 * through the caller's transaction. A worker in the same process (tests, development) can be
 * attached so that a new job is picked up at once instead of at the next poll.
 */
export function createJobQueue(db: DbOrTx, settings: JobSettings = defaultJobSettings) {
  const boss = new PgBoss({ db: jobExecutor(db) })
  const options = queueOptions(settings)
  let waker: ((queue: QueueName) => void) | undefined
  return {
    /**
     * Adds a job in `tx`'s transaction (or on its own); answers the job's id. `startAfter` holds
     * it back until then (a reminder on its day).
     */
    async send(tx: DbOrTx, queue: QueueName, data: object, timing: { startAfter?: Date } = {}) {
      const id = await boss.send(queue, data, {
        ...options[queue],
        ...timing,
        db: jobExecutor(tx),
      })
      // pg-boss writes nothing, and answers null, for a queue it does not have: a database whose
      // job queues this release's `npm run db:migrate` has not installed yet. Told, not lost.
      if (id === null) {
        throw new AppError(
          503,
          'jobs_not_ready',
          'The server is not ready for this yet (its job queues are missing). Try again later.',
        )
      }
      // A worker in this process looks a moment later, once the caller's transaction committed.
      if (waker) setTimeout(() => waker?.(queue), 30).unref()
      return id
    },
    /**
     * True when the job will not run again (its last attempt failed, or it was cancelled), from
     * the live or the archived jobs.
     */
    async gaveUp(queue: QueueName, id: string) {
      const job = await boss.getJobById(queue, id, { includeArchive: true, db: jobExecutor(db) })
      return job?.state === 'failed' || job?.state === 'cancelled'
    },
    attachWorker(wake: (queue: QueueName) => void) {
      waker = wake
    },
  }
}

export type JobQueue = ReturnType<typeof createJobQueue>

/** The queues of this release that the database lacks (all of them before the first migration). */
export async function missingQueues(db: DbOrTx): Promise<string[]> {
  const { rows: schema } = await db.execute<{ present: boolean }>(
    sql`select to_regclass('pgboss.queue') is not null as present`,
  )
  const wanted: string[] = Object.values(queues)
  if (!schema[0]?.present) return wanted
  const { rows } = await db.execute<{ name: string }>(sql`select name from pgboss.queue`)
  const present = new Set(rows.map((r) => r.name))
  return wanted.filter((name) => !present.has(name))
}

/**
 * Installs or updates pg-boss's own tables (schema `pgboss`) and Twofold's queues. Part of the
 * migration step: web and worker processes only check that they are there.
 */
export async function ensureJobSchema(db: PgBoss.Db, settings = defaultJobSettings) {
  const boss = new PgBoss({
    db,
    migrate: true,
    supervise: false,
    schedule: false,
  })
  boss.on('error', () => {})
  await boss.start()
  try {
    for (const [name, options] of Object.entries(queueOptions(settings))) {
      if (await boss.getQueue(name)) await boss.updateQueue(name, { name, ...options })
      else await boss.createQueue(name, { name, ...options })
    }
  } finally {
    await boss.stop({ graceful: false, wait: true })
  }
}
