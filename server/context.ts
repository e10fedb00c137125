import type { Logger } from 'pino'
import type { Limits } from './auth/limits.ts'
import type { Sessions } from './auth/sessions.ts'
import type { Db } from './db/client.ts'
import { linkOrigin, type Env } from './env.ts'
import type { JobQueue } from './jobs/queue.ts'
import type { Mailer } from './mail/mailer.ts'
import type { ClipStore } from './storage/clip-store.ts'

/** What routes and services share: built once in createApp. */
export interface AppContext {
  env: Env
  db: Db
  sessions: Sessions
  mailer: Mailer
  limits: Limits
  logger: Logger
  /** Background work: audits, club archives and mail, done by workers. */
  jobs: JobQueue
  /** Where clip videos are stored; null when clips are turned off or have no bucket. */
  clips: ClipStore | null
}

/**
 * The address links in e-mails point at: PUBLIC_URL, else the address the server listens on.
 * Never built from a request's Host or X-Forwarded-* headers, which a client can forge.
 */
export function publicOrigin(env: Env) {
  return linkOrigin(env)
}
