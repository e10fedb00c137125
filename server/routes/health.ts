import type { RequestHandler } from 'express'
import type { Database } from '../db/client.ts'

/** `GET /api/health`: liveness and database reachability, for people and for monitoring. */
export function healthCheck(database: Database): RequestHandler {
  return async (_req, res) => {
    const up = await database.ping()
    res
      .status(up ? 200 : 503)
      .json({ status: up ? 'ok' : 'degraded', database: up ? 'up' : 'down' })
  }
}
