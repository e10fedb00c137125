import { existsSync } from 'node:fs'
import type { Server } from 'node:http'
import { join } from 'node:path'
import { pathToFileURL } from 'node:url'
import type { Logger } from 'pino'
import { createApp } from './app.ts'
import { schedulePurge } from './auth/purge.ts'
import { createDatabase } from './db/client.ts'
import type { AppContext } from './context.ts'
import { EnvError, jobSettingsOf, parseEnv, type Env } from './env.ts'
import { startJobWorker } from './jobs/worker.ts'
import { createLogger } from './logger.ts'
import { createMailer } from './mail/mailer.ts'
import { projectDir } from './paths.ts'
import { closePlannerPool } from './services/planner-pool.ts'

export const defaultClientDir = join(projectDir, 'dist')

export interface Serving {
  server: Server
  url: string
  /** The local mail viewer, when no mail provider is configured. */
  mailViewerUrl?: string
  /** The local fake mail server, for worker processes to send through. */
  fakeSmtpUrl?: string
  logger: Logger
  /** Stops taking connections, lets in-flight requests finish, then closes the pool. */
  close(): Promise<void>
}

/** Starts the HTTP server for the API and (when built) the client. */
export async function serve(
  env: Env,
  options: {
    clientDir?: string
    /** Run a job worker in this process too (tests, development); else workers run apart. */
    worker?: boolean
  } = {},
): Promise<Serving> {
  if (!env.DATABASE_URL) throw new EnvError('Invalid environment:\n  DATABASE_URL: required')
  const clientDir = options.clientDir ?? defaultClientDir
  // Production serves the client built beforehand, never building it itself.
  if (env.NODE_ENV === 'production' && !existsSync(join(clientDir, 'index.html')))
    throw new EnvError(`No client build in ${clientDir}: run \`npm run build\` first.`)
  const logger = createLogger(env)
  const database = createDatabase(env.DATABASE_URL, logger)
  const mailer = await createMailer(env, logger)
  const app = createApp({
    env,
    database,
    logger,
    mailer,
    clientDir,
  })
  const worker = options.worker
    ? await startJobWorker({
        connectionString: env.DATABASE_URL,
        db: database.db,
        mailer,
        logger,
        settings: jobSettingsOf(env),
        clips: (app.locals.context as AppContext).clips,
      })
    : undefined
  if (worker) (app.locals.context as AppContext).jobs.attachWorker(worker.wake)
  const server = await new Promise<Server>((resolve, reject) => {
    const s = app.listen(env.PORT, env.HOST, (err?: Error) => {
      if (!err) return resolve(s)
      void worker?.stop(0)
      void database.close()
      void mailer.close()
      reject(
        (err as NodeJS.ErrnoException).code === 'EADDRINUSE'
          ? new EnvError(
              `Port ${env.PORT} on ${env.HOST} is in use: stop what runs there or set PORT.`,
            )
          : err,
      )
    })
  })
  const url = `http://${env.HOST}:${env.PORT}`
  const stopPurge = schedulePurge(database.db, (err) =>
    logger.warn({ err: (err as Error).message }, 'purge of expired sessions and links failed'),
  )
  let closing: Promise<void> | undefined
  const close = () =>
    (closing ??= new Promise<void>((resolve) => {
      stopPurge()
      // Idle keep-alive sockets would hold close() open; in-flight requests get 10 s to finish.
      const force = setTimeout(() => server.closeAllConnections(), 10_000)
      server.close(() => {
        clearTimeout(force)
        Promise.allSettled([
          (async () => {
            await worker?.stop()
            await database.close()
          })(),
          mailer.close(),
          closePlannerPool(),
        ]).then(() => resolve())
      })
      server.closeIdleConnections()
    }))
  return {
    server,
    url,
    mailViewerUrl: mailer.viewer?.url,
    fakeSmtpUrl: mailer.fake ? `smtp://127.0.0.1:${mailer.fake.port}` : undefined,
    logger,
    close,
  }
}

/** Runs until SIGINT or SIGTERM, then shuts down gracefully and runs `onStop`. */
export function stopOnSignals(serving: Serving, onStop: () => void | Promise<void> = () => {}) {
  let stopping = false
  const stop = async (signal: string) => {
    if (stopping) return
    stopping = true
    console.log(`\n${signal} received: finishing requests and shutting down…`)
    await serving.close()
    await onStop()
    process.exit(0)
  }
  process.on('SIGINT', () => void stop('SIGINT'))
  process.on('SIGTERM', () => void stop('SIGTERM'))
  // The terminal that started it closed.
  process.on('SIGHUP', () => void stop('SIGHUP'))
}

/**
 * An error nothing caught leaves the process in a state no one planned for: log it, finish the
 * requests in flight as at SIGTERM, and exit non-zero so that the supervisor starts a new one.
 */
export function stopOnUncaughtErrors(serving: Serving) {
  const fail = (what: string) => (err: unknown) => {
    serving.logger.fatal({ err }, `${what}: shutting down`)
    // close() gives requests 10 s; should it hang on something else, exit anyway.
    setTimeout(() => process.exit(1), 15_000).unref()
    void serving.close().finally(() => process.exit(1))
  }
  process.on('unhandledRejection', fail('unhandled rejection'))
  process.on('uncaughtException', fail('uncaught exception'))
}

// The production entry (`npm run serve`, compiled): every setting from the environment, nothing
// installed, started, built or seeded here.
if (process.argv[1] && import.meta.url === pathToFileURL(process.argv[1]).href) {
  try {
    const serving = await serve(parseEnv())
    stopOnSignals(serving)
    stopOnUncaughtErrors(serving)
    serving.logger.info({ url: serving.url }, `Twofold is serving on ${serving.url}`)
  } catch (err) {
    console.error(err instanceof EnvError ? err.message : err)
    process.exit(1)
  }
}
