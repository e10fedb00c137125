import { Router } from 'express'
import type { Database } from '../db/client.ts'

/** Liveness and database reachability, for people and for monitoring. */
export function healthRouter(database: Database) {
  const router = Router()
  router.get('/health', async (_req, res) => {
    const up = await database.ping()
    res
      .status(up ? 200 : 503)
      .json({ status: up ? 'ok' : 'degraded', database: up ? 'up' : 'down' })
  })
  return router
}
