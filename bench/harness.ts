import { performance } from 'node:perf_hooks'
import pino from 'pino'
import { createApp } from '../server/app.ts'
import { parseEnv } from '../server/env.ts'
import { createMailer } from '../server/mail/mailer.ts'
import { createDatabase, type Database } from '../server/db/client.ts'
import { applyMigrations } from '../server/db/migrate.ts'
import {
  clusterUrl,
  ensureDatabase,
  removeCluster,
  startCluster,
  throwawayCluster,
} from '../server/cli/postgres.ts'

export interface Timing {
  median: number
  p95: number
}

/** Runs `fn` `runs` times after `warmup` untimed runs; milliseconds. */
export async function time(fn: () => Promise<unknown>, runs = 50, warmup = 5): Promise<Timing> {
  for (let i = 0; i < warmup; i++) await fn()
  const samples: number[] = []
  for (let i = 0; i < runs; i++) {
    const start = performance.now()
    await fn()
    samples.push(performance.now() - start)
  }
  samples.sort((a, b) => a - b)
  const at = (q: number) => samples[Math.min(samples.length - 1, Math.floor(q * samples.length))]!
  return { median: at(0.5), p95: at(0.95) }
}

export function report(name: string, subject: Timing, baseline: Timing, baselineName: string) {
  const fmt = (t: Timing) => `median ${t.median.toFixed(2)} ms, p95 ${t.p95.toFixed(2)} ms`
  console.log(`\n${name}`)
  console.log(`  measured:  ${fmt(subject)}`)
  console.log(`  baseline (${baselineName}): ${fmt(baseline)}`)
  console.log(`  ratio (median): ${(subject.median / baseline.median).toFixed(2)}×`)
}

/** A throwaway migrated database for one benchmark, removed afterwards. */
export async function withBenchDatabase<T>(fn: (database: Database) => Promise<T>): Promise<T> {
  const cluster = await throwawayCluster('twofold-bench-')
  startCluster(cluster)
  await ensureDatabase(cluster, 'bench')
  const database = createDatabase(clusterUrl(cluster, 'bench'))
  try {
    await applyMigrations(database.db)
    return await fn(database)
  } finally {
    await database.close()
    removeCluster(cluster)
  }
}

/** The app over a bench database, logging nothing; close its mailer when done. */
export async function benchApp(database: Database, clientDir?: string) {
  const env = parseEnv({ LOG_LEVEL: 'silent' })
  const mailer = await createMailer(env)
  const app = createApp({ mailer, env, database, logger: pino({ level: 'silent' }), clientDir })
  return { app, mailer }
}
