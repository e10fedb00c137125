import pino from 'pino'
import { createApp } from '../../server/app.ts'
import type { LimitRules } from '../../server/auth/limits.ts'
import type { Database } from '../../server/db/client.ts'
import { parseEnv, type Env } from '../../server/env.ts'
import { createMailer, type Mailer } from '../../server/mail/mailer.ts'
import type { ClubRoute } from '../../server/routes/club-routes.ts'
import type { AppContext } from '../../server/context.ts'

export const testEnv = parseEnv({ NODE_ENV: 'test', LOG_LEVEL: 'silent' })

export interface TestApp {
  app: ReturnType<typeof createApp>
  mailer: Mailer
  clubRoutes: ClubRoute[]
  context: AppContext
  close(): Promise<void>
}

/** The real app over a test database, with the local fake mail server and no built client. */
export async function testApp(
  database: Database,
  options: { env?: Partial<Env>; limits?: LimitRules } = {},
): Promise<TestApp> {
  const env = { ...testEnv, ...options.env }
  const mailer = await createMailer(env)
  const app = createApp({
    env,
    database,
    logger: pino({ level: 'silent' }),
    mailer,
    limits: options.limits,
  })
  return {
    app,
    mailer,
    clubRoutes: app.locals.clubRoutes as ClubRoute[],
    context: app.locals.context as AppContext,
    close: () => mailer.close(),
  }
}
