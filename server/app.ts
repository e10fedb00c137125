import { existsSync } from 'node:fs'
import { join } from 'node:path'
import express from 'express'
import helmet from 'helmet'
import { pinoHttp } from 'pino-http'
import type { Logger } from 'pino'
import type { Database } from './db/client.ts'
import type { Env } from './env.ts'
import { apiNotFound, errorHandler } from './http/errors.ts'
import { healthRouter } from './routes/health.ts'

export interface AppOptions {
  env: Env
  database: Database
  logger: Logger
  /** The built client (vite build output) to serve; omitted in tests and under `npm run dev`. */
  clientDir?: string
}

export function createApp({ env, database, logger, clientDir }: AppOptions) {
  const app = express()
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
      strictTransportSecurity: env.TRUST_PROXY,
    }),
  )
  app.use(pinoHttp({ logger, autoLogging: { ignore: (req) => req.url === '/api/health' } }))
  app.use(express.json({ limit: '1mb' }))

  const api = express.Router()
  api.use(healthRouter(database))
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
