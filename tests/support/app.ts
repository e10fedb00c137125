import pino from 'pino'
import { createApp } from '../../server/app.ts'
import type { LimitRules } from '../../server/auth/limits.ts'
import type { JobSettings } from '../../server/jobs/queue.ts'
import { startJobWorker } from '../../server/jobs/worker.ts'
import type { Database } from '../../server/db/client.ts'
import { startFakeS3, type FakeS3 } from '../../server/cli/fake-s3.ts'
import { parseEnv, type Env } from '../../server/env.ts'
import { createMailer, type Mailer } from '../../server/mail/mailer.ts'
import type { ClubRoute } from '../../server/routes/club-routes.ts'
import type { AppContext } from '../../server/context.ts'

export const testEnv = parseEnv({ NODE_ENV: 'test', LOG_LEVEL: 'silent' })

/** Workers poll often in tests, where a job is usually also woken at once. */
export const testJobSettings: JobSettings = {
  auditTimeoutSeconds: 60,
  pollSeconds: 0.5,
  maintenanceSeconds: 30,
}

export interface TestApp {
  app: ReturnType<typeof createApp>
  mailer: Mailer
  clubRoutes: ClubRoute[]
  context: AppContext
  /** The local S3 fake the clips go to. */
  s3: FakeS3
  close(): Promise<void>
}

/**
 * The real app over a test database, with the local fake mail server, a local S3 fake for the
 * clips (in a temporary folder) and no built client.
 */
export async function testApp(
  database: Database,
  options: { env?: Partial<Env>; limits?: LimitRules; worker?: boolean } = {},
): Promise<TestApp> {
  const s3 = await startFakeS3()
  const env = {
    ...parseEnv({ NODE_ENV: 'test', LOG_LEVEL: 'silent', ...s3.vars }),
    ...options.env,
  }
  const mailer = await createMailer(env)
  const logger = pino({ level: 'silent' })
  const app = createApp({ env, database, logger, mailer, limits: options.limits })
  const context = app.locals.context as AppContext
  // Audits and mail are done by a worker in this process, as in development.
  const worker =
    options.worker === false
      ? undefined
      : await startJobWorker({
          connectionString: database.url,
          db: database.db,
          mailer,
          logger,
          settings: testJobSettings,
          clips: context.clips,
        })
  if (worker) context.jobs.attachWorker(worker.wake)
  return {
    app,
    mailer,
    clubRoutes: app.locals.clubRoutes as ClubRoute[],
    context,
    s3,
    async close() {
      await worker?.stop(2_000)
      await mailer.close()
      await s3.close()
    },
  }
}
