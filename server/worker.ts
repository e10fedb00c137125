import { pathToFileURL } from 'node:url'
import { createDatabase } from './db/client.ts'
import { EnvError, jobSettingsOf, parseEnv } from './env.ts'
import { lowerAutogroupPriority, lowerProcessPriority } from './jobs/priority.ts'
import { startJobWorker } from './jobs/worker.ts'
import { createLogger } from './logger.ts'
import { createMailer } from './mail/mailer.ts'
import { createClipStore } from './storage/clip-store.ts'

/** How much lower than the web processes a worker runs (nice 10 of 19). */
const workerNiceness = 10

/**
 * A worker process: does the audits and sends the mail that web processes put on the queues.
 * Run as many as the work needs, on any machine that reaches the database and the mail server.
 * SIGTERM lets the jobs in hand finish; a job left by a worker that died is retried by another.
 */
export async function runWorker() {
  const env = parseEnv()
  // Where a worker shares cores with web processes, the requests go first: an audit can wait a
  // moment, a person at a tablet should not. Raising one's own niceness needs no privilege; a
  // system that refuses leaves the worker at normal priority.
  lowerProcessPriority(workerNiceness)
  const autogroup = lowerAutogroupPriority(workerNiceness)
  if (!env.DATABASE_URL) throw new EnvError('Invalid environment:\n  DATABASE_URL: required')
  const logger = createLogger(env)
  if (autogroup === 'shared') {
    logger.warn(
      'this worker does not lead a session of its own, so it leaves its CPU share as it is: start it with setsid (or under a service manager) so that web processes and the database go first',
    )
  } else if (autogroup === 'refused') {
    logger.warn("the system refused to lower this worker session's CPU share")
  }
  const database = createDatabase(env.DATABASE_URL, logger)
  const mailer = await createMailer(env, logger)
  const worker = await startJobWorker({
    connectionString: env.DATABASE_URL,
    db: database.db,
    mailer,
    logger,
    settings: jobSettingsOf(env),
    clips: createClipStore(env),
  })
  logger.info('worker started')
  let stopping = false
  const stop = async (reason: string, code: number) => {
    if (stopping) return
    stopping = true
    logger.info({ reason }, 'worker stopping')
    await worker.stop().catch(() => undefined)
    await Promise.allSettled([database.close(), mailer.close()])
    process.exit(code)
  }
  process.on('SIGTERM', () => void stop('SIGTERM', 0))
  // Started by `npm start` or a benchmark, with a channel to it: when that process ends, however
  // it ends (a closed terminal, SIGKILL), the channel closes and the worker stops too.
  if (process.send) process.once('disconnect', () => void stop('parent gone', 0))
  process.on('SIGINT', () => void stop('SIGINT', 0))
  process.on('unhandledRejection', (err) => {
    logger.fatal({ err }, 'unhandled rejection')
    void stop('unhandledRejection', 1)
  })
  process.on('uncaughtException', (err) => {
    logger.fatal({ err }, 'uncaught exception')
    void stop('uncaughtException', 1)
  })
}

if (process.argv[1] && import.meta.url === pathToFileURL(process.argv[1]).href) {
  try {
    await runWorker()
  } catch (err) {
    console.error(err instanceof EnvError ? err.message : err)
    process.exit(1)
  }
}
