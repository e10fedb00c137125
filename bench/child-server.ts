import { mkdtempSync, writeFileSync } from 'node:fs'
import { tmpdir } from 'node:os'
import { join } from 'node:path'
import express from 'express'
import pg from 'pg'
import type { ReplayedRoute } from './load.ts'

/**
 * A server for a benchmark to load from outside its own process, so that the load generator
 * does not share its event loop. `app`: Twofold's web process as the production entry starts it
 * (`serve`, settings from the environment). `bare`: Express 5 and a pg pool of the same size
 * alone, answering `/api/health` with `select 1` and each replayed path by running the given SQL
 * statements in order, with their rows as the JSON body.
 */
const mode = process.argv[2]
const port = Number(process.env.PORT)

if (mode === 'app') {
  // Production refuses to start without a client build; the API is what is measured.
  const clientDir = mkdtempSync(join(tmpdir(), 'twofold-bench-client-'))
  writeFileSync(join(clientDir, 'index.html'), '<!doctype html><title>Twofold</title>')
  // Imported here only: the bare server loads none of the app.
  const { parseEnv } = await import('../server/env.ts')
  const { serve } = await import('../server/index.ts')
  const serving = await serve(parseEnv(), { clientDir })
  process.on('SIGTERM', () => void serving.close().then(() => process.exit(0)))
} else if (mode === 'bare') {
  const routes = JSON.parse(process.env.BENCH_ROUTES ?? '[]') as ReplayedRoute[]
  const pool = new pg.Pool({
    connectionString: process.env.DATABASE_URL,
    max: 10,
    connectionTimeoutMillis: 3_000,
    idleTimeoutMillis: 30_000,
  })
  const app = express()
  app.get('/api/health', async (_req, res) => {
    await pool.query('select 1')
    res.json({ status: 'ok', database: 'up' })
  })
  for (const route of routes) {
    app.get(route.path, async (_req, res) => {
      const rows: unknown[] = []
      for (const s of route.statements) rows.push((await pool.query(s)).rows)
      res.json(rows)
    })
  }
  app.listen(port, '127.0.0.1')
  process.on('SIGTERM', () => process.exit(0))
} else {
  console.error('usage: child-server.ts app|bare')
  process.exit(2)
}
