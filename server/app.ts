import { existsSync } from 'node:fs'
import { join } from 'node:path'
import express from 'express'
import compression from 'compression'
import helmet from 'helmet'
import { pinoHttp } from 'pino-http'
import type { Logger } from 'pino'
import { requestForLog } from './logger.ts'
import { requireClubAccess } from './auth/club-access.ts'
import { createSessions } from './auth/sessions.ts'
import {
  createLimits,
  defaultPasswordRules,
  defaultResetRules,
  type LimitRules,
} from './auth/limits.ts'
import type { AppContext } from './context.ts'
import type { Database } from './db/client.ts'
import { jobSettingsOf, type Env } from './env.ts'
import { apiNotFound, errorHandler } from './http/errors.ts'
import { refuseUnstorableText } from './http/input-guards.ts'
import { noStore } from './http/no-store.ts'
import { requireSameOrigin } from './http/same-origin.ts'
import { createJobQueue } from './jobs/queue.ts'
import type { Mailer } from './mail/mailer.ts'
import { authRouter } from './routes/auth.ts'
import { clubRoutesRouter, type ClubRoute } from './routes/club-routes.ts'
import { healthCheck } from './routes/health.ts'
import { allClubRoutes } from './routes/index.ts'
import { signupRouter } from './routes/signup.ts'
import { createClipStore } from './storage/clip-store.ts'

export interface AppOptions {
  env: Env
  database: Database
  logger: Logger
  mailer: Mailer
  /** Limits on password checks and reset requests; tests make them small. */
  limits?: LimitRules
  /** The built client (vite build output) to serve; omitted in tests and under `npm run dev`. */
  clientDir?: string
}

export function createApp({ env, database, logger, mailer, limits, clientDir }: AppOptions) {
  const sessions = createSessions(database.db, {
    idleMinutes: env.SESSION_IDLE_MINUTES,
    absoluteHours: env.SESSION_ABSOLUTE_HOURS,
    secure: env.PUBLIC_URL?.startsWith('https:') ?? false,
  })
  const ctx: AppContext = {
    env,
    db: database.db,
    sessions,
    mailer,
    limits: createLimits(
      database.pool,
      limits ?? { password: defaultPasswordRules, reset: defaultResetRules },
    ),
    logger,
    jobs: createJobQueue(database.db, jobSettingsOf(env)),
    clips: createClipStore(env),
  }
  const clubRoutes: ClubRoute[] = allClubRoutes(ctx)

  const app = express()
  app.locals.clubRoutes = clubRoutes
  app.locals.context = ctx
  app.disable('x-powered-by')
  app.set('trust proxy', env.TRUST_PROXY)

  app.use(
    helmet({
      contentSecurityPolicy: {
        useDefaults: false,
        directives: {
          defaultSrc: ["'self'"],
          scriptSrc: ["'self'"],
          // Naive UI injects its component styles at run time.
          styleSrc: ["'self'", "'unsafe-inline'"],
          fontSrc: ["'self'"],
          imgSrc: ["'self'", 'data:', 'blob:'],
          connectSrc: ["'self'"],
          objectSrc: ["'none'"],
          baseUri: ["'self'"],
          formAction: ["'self'"],
          frameAncestors: ["'none'"],
          ...(env.TRUST_PROXY ? { upgradeInsecureRequests: [] } : {}),
        },
      },
      // Plain HTTP on loopback must not be told to switch to HTTPS.
      strictTransportSecurity:
        Boolean(env.TRUST_PROXY) || Boolean(env.PUBLIC_URL?.startsWith('https:')),
    }),
  )
  // Monitoring asks often and is never logged (its body is a few bytes, never compressed): it
  // answers before the request log and compression set themselves up on the request.
  app.get('/api/health', noStore, healthCheck(database))
  // A large club's audit report runs to megabytes of JSON, read on tablets in the gym. An answer
  // under 8 kB goes out in the first round trip anyway (a TCP connection starts with about 14 kB
  // in flight), so compressing it would only cost the server time.
  app.use(compression({ threshold: '8kb' }))
  app.use(
    pinoHttp({
      logger,
      serializers: { req: requestForLog },
    }),
  )
  app.use(express.json({ limit: '1mb' }))

  const api = express.Router()
  api.use(requireSameOrigin(env.PUBLIC_URL))
  api.use(noStore)
  api.use(refuseUnstorableText)
  api.use(sessions.load)
  api.use('/auth', authRouter(ctx))
  api.use('/signup', signupRouter(ctx))
  api.use('/clubs/:clubId', requireClubAccess(database.db, sessions), clubRoutesRouter(clubRoutes))
  api.use(apiNotFound)
  app.use('/api', api)

  if (clientDir && existsSync(join(clientDir, 'index.html'))) {
    app.use(express.static(clientDir, { index: false, maxAge: '1h' }))
    app.get('/{*splat}', (_req, res) => {
      res.setHeader('Cache-Control', 'no-cache')
      res.sendFile(join(clientDir, 'index.html'))
    })
  }

  app.use(errorHandler)
  return app
}
