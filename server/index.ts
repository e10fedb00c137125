import type { Server } from 'node:http'
import { fileURLToPath, pathToFileURL } from 'node:url'
import { createApp } from './app.ts'
import { schedulePurge } from './auth/purge.ts'
import { createDatabase } from './db/client.ts'
import type { AppContext } from './context.ts'
import { EnvError, jobSettingsOf, parseEnv, type Env } from './env.ts'
import { startJobWorker } from './jobs/worker.ts'
import { createLogger } from './logger.ts'
import { closeReportPdfPool } from './services/report-pdf-pool.ts'
import { createMailer } from './mail/mailer.ts'

export const defaultClientDir = fileURLToPath(new URL('../dist', import.meta.url))

export interface Serving {
  server: Server
  url: string
  /** The local mail viewer, when no mail provider is configured. */
  mailViewerUrl?: string
  /** The local fake mail server, for worker processes to send through. */
  fakeSmtpUrl?: string
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
  const logger = createLogger(env)
  const database = createDatabase(env.DATABASE_URL, logger)
  const mailer = await createMailer(env, logger)
  const app = createApp({
    env,
    database,
    logger,
    mailer,
    clientDir: options.clientDir ?? defaultClientDir,
  })
  const worker = options.worker
    ? await startJobWorker({
        connectionString: env.DATABASE_URL,
        db: database.db,
        mailer,
        logger,
        settings: jobSettingsOf(env),
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
          closeReportPdfPool(),
        ]).then(() => resolve())
      })
      server.closeIdleConnections()
    }))
  return {
    server,
    url,
    mailViewerUrl: mailer.viewer?.url,
    fakeSmtpUrl: mailer.fake ? `smtp://127.0.0.1:${mailer.fake.port}` : undefined,
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
}

if (process.argv[1] && import.meta.url === pathToFileURL(process.argv[1]).href) {
  try {
    const serving = await serve(parseEnv())
    console.log(`Twofold is serving on ${serving.url}`)
    stopOnSignals(serving)
  } catch (err) {
    console.error(err instanceof EnvError ? err.message : err)
    process.exit(1)
  }
}
