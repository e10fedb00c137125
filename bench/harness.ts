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
  const [timing] = await timeInTurn([fn], runs, warmup)
  return timing!
}

/**
 * Times several functions in turn (a, b, a, b, …), each `runs` times after `warmup` untimed
 * rounds; milliseconds. A machine whose speed drifts over a minute (other guests on a shared
 * host, a database's background work) then slows each of them alike, so the ratio of their
 * medians measures the code rather than the moment each one happened to run at.
 */
export async function timeInTurn(
  fns: readonly (() => Promise<unknown>)[],
  runs = 50,
  warmup = 5,
): Promise<Timing[]> {
  for (let i = 0; i < warmup; i++) for (const fn of fns) await fn()
  const samples = fns.map((): number[] => [])
  for (let i = 0; i < runs; i++) {
    for (const [k, fn] of fns.entries()) {
      const start = performance.now()
      await fn()
      samples[k]!.push(performance.now() - start)
    }
  }
  return samples.map((list) => {
    list.sort((a, b) => a - b)
    const at = (q: number) => list[Math.min(list.length - 1, Math.floor(q * list.length))]!
    return { median: at(0.5), p95: at(0.95) }
  })
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
