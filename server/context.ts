import type { Request } from 'express'
import type { Logger } from 'pino'
import type { SignInThrottle } from './auth/throttle.ts'
import type { Sessions } from './auth/sessions.ts'
import type { Db } from './db/client.ts'
import type { Env } from './env.ts'
import type { Mailer } from './mail/mailer.ts'
import type { AuditJobs } from './services/audit-jobs.ts'

/** What routes and services share: built once in createApp. */
export interface AppContext {
  env: Env
  db: Db
  sessions: Sessions
  mailer: Mailer
  throttle: SignInThrottle
  logger: Logger
  auditJobs: AuditJobs
}

/** The address links in e-mails point at: PUBLIC_URL, else the origin of the request. */
export function publicOrigin(env: Env, req: Request) {
  return env.PUBLIC_URL ? new URL(env.PUBLIC_URL).origin : `${req.protocol}://${req.get('host')}`
}
