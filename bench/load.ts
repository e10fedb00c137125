import { fork, spawn } from 'node:child_process'
import { fileURLToPath } from 'node:url'
import autocannon from 'autocannon'
import type pg from 'pg'
import { freePort } from '../server/cli/postgres.ts'
import type { PacedResponse } from './clock.ts'

/**
 * A GET path of the bare server and the statements it runs, in order, for each request; a
 * statement the app prepares under a name is prepared under the same name.
 */
export interface ReplayedRoute {
  path: string
  statements: { name?: string; text: string; values: unknown[] }[]
}

export interface ChildServer {
  url: string
  stop(): Promise<void>
}

const childEntry = fileURLToPath(new URL('./child-server.ts', import.meta.url))

/**
 * Starts `bench/child-server.ts` (the web app, or the bare baseline) in a process of its own
 * and resolves once its health check answers.
 */
export async function startServer(
  mode: 'app' | 'bare',
  env: Record<string, string>,
): Promise<ChildServer> {
  const port = await freePort()
  const url = `http://127.0.0.1:${port}`
  const child = spawn(process.execPath, ['--import', 'tsx', childEntry, mode], {
    env: {
      PATH: process.env.PATH ?? '',
      HOST: '127.0.0.1',
      PORT: String(port),
      PUBLIC_URL: url,
      ...env,
    },
    // The app logs a JSON line per request, as in production; they go nowhere here.
    stdio: ['ignore', 'ignore', 'inherit'],
  })
  const exited = new Promise<void>((resolve) => child.once('exit', () => resolve()))
  for (let i = 0; ; i++) {
    if (child.exitCode !== null) throw new Error(`the ${mode} server exited (${child.exitCode})`)
    const status = await fetch(`${url}/api/health`).then(
      (r) => r.status,
      () => 0,
    )
    if (status === 200) break
    if (i > 300) throw new Error(`the ${mode} server did not start`)
    await new Promise((r) => setTimeout(r, 100))
  }
  return {
    url,
    async stop() {
      if (child.exitCode !== null) return
      child.kill('SIGTERM')
      const timer = setTimeout(() => child.kill('SIGKILL'), 15_000)
      await exited
      clearTimeout(timer)
    },
  }
}

/** The environment of a web process as production runs it, over `databaseUrl`. */
export function appEnvironment(databaseUrl: string, extra: Record<string, string> = {}) {
  return {
    NODE_ENV: 'production',
    DATABASE_URL: databaseUrl,
    // Required in production; nothing here sends mail from the web process.
    SMTP_URL: 'smtp://127.0.0.1:9',
    // Clips are not measured; with them on, production would want a bucket.
    CLIPS_ENABLED: 'false',
    ...extra,
  }
}

/**
 * Runs `fn` with every statement sent through `pool.query` recorded, text and parameters, in
 * the order they were sent.
 */
export async function captureStatements(
  pool: pg.Pool,
  fn: () => Promise<unknown>,
): Promise<ReplayedRoute['statements']> {
  const statements: ReplayedRoute['statements'] = []
  const original = pool.query
  const recording = function (this: pg.Pool, ...args: unknown[]) {
    const [first, second] = args as [
      string | { name?: string; text: string; values?: unknown[] },
      unknown,
    ]
    const config = typeof first === 'string' ? { text: first } : first
    const values = Array.isArray(second) ? second : (config.values ?? [])
    statements.push({ ...(config.name ? { name: config.name } : {}), text: config.text, values })
    return (original as (...a: unknown[]) => unknown).apply(this, args)
  }
  pool.query = recording as typeof pool.query
  try {
    await fn()
  } finally {
    pool.query = original
  }
  return statements
}

export interface Rate {
  perSecond: number
  p99: number
}

export interface Comparison {
  subject: Rate
  baseline: Rate
  /** subject / baseline of each pair of turns, lowest and highest. */
  spread: [number, number]
}

/** What a browser sends with every request, as the app sees it (cookies apart). */
const browserHeaders = { 'accept-encoding': 'gzip, deflate, br, zstd' }

const load = (url: string, connections: number, seconds: number, headers: Record<string, string>) =>
  autocannon({
    url,
    connections,
    duration: seconds,
    headers: { ...browserHeaders, ...headers },
  }).then((result) => {
    if (result.non2xx || result.errors || result.timeouts) {
      throw new Error(
        `${url}: ${result.non2xx} non-2xx, ${result.errors} errors, ${result.timeouts} timeouts`,
      )
    }
    return { perSecond: result.requests.average, p99: result.latency.p99 }
  })

/**
 * Requests per second that `connections` clients, each sending its next request as soon as the
 * last is answered and each saying, as browsers do, which compressions it accepts, get from
 * `subject` and from `baseline` (fails on any error or status other than 2xx). After a warm-up of each, the two take turns in the order ABBA ABBA …, so that a
 * change in the machine's other load falls on both alike.
 */
export async function compareRates(
  subject: { url: string; headers?: Record<string, string> },
  baseline: { url: string; headers?: Record<string, string> },
  { connections = 20, rounds = 3, seconds = 4, warmupSeconds = 3 } = {},
): Promise<Comparison> {
  const run = (target: typeof subject, s: number) =>
    load(target.url, connections, s, target.headers ?? {})
  await run(subject, warmupSeconds)
  await run(baseline, warmupSeconds)
  const subjects: Rate[] = []
  const baselines: Rate[] = []
  for (let i = 0; i < rounds; i++) {
    subjects.push(await run(subject, seconds))
    baselines.push(await run(baseline, seconds))
    baselines.push(await run(baseline, seconds))
    subjects.push(await run(subject, seconds))
  }
  const mean = (rates: Rate[]): Rate => ({
    perSecond: rates.reduce((sum, r) => sum + r.perSecond, 0) / rates.length,
    p99: Math.max(...rates.map((r) => r.p99)),
  })
  const ratios = subjects.map((s, i) => s.perSecond / baselines[i]!.perSecond)
  return {
    subject: mean(subjects),
    baseline: mean(baselines),
    spread: [Math.min(...ratios), Math.max(...ratios)],
  }
}

export function reportRates(
  name: string,
  { subject, baseline, spread }: Comparison,
  baselineName: string,
) {
  const fmt = (r: Rate) => `${r.perSecond.toFixed(0)} req/s (p99 up to ${r.p99} ms)`
  const pct = (x: number) => `${(100 * x).toFixed(0)}%`
  console.log(`\n${name}`)
  console.log(`  measured:  ${fmt(subject)}`)
  console.log(`  baseline (${baselineName}): ${fmt(baseline)}`)
  console.log(
    `  ratio (req/s): ${pct(subject.perSecond / baseline.perSecond)} (turn by turn ${pct(spread[0])}–${pct(spread[1])})`,
  )
}

export interface Paced {
  /** Each response (see `PacedResponse`), once `stop()` has resolved; empty before. */
  responses: PacedResponse[]
  /** Stops sending and resolves once every request sent has been answered. */
  stop(): Promise<void>
}

/**
 * GETs `url` at a steady `perSecond` from a process of its own (paced-child.ts), each request
 * sent on time whether or not the earlier ones were answered (so a stall shows in the latencies
 * instead of slowing the sender down), over kept-alive connections. Resolves once it sends.
 * Responses are timed on `clock()`, so windows of this process compare with them.
 */
export async function paced(url: string, perSecond: number): Promise<Paced> {
  const child = fork(
    fileURLToPath(new URL('./paced-child.ts', import.meta.url)),
    [url, String(perSecond)],
    {
      execArgv: ['--import', 'tsx'],
      stdio: ['ignore', 'inherit', 'inherit', 'ipc'],
    },
  )
  const exited = new Promise<void>((resolve) => child.once('exit', () => resolve()))
  await new Promise<void>((resolve, reject) => {
    child.once('message', () => resolve())
    child.once('exit', (code) => reject(new Error(`the paced sender exited (${code})`)))
  })
  const responses: PacedResponse[] = []
  return {
    responses,
    async stop() {
      // Should the sender have died meanwhile, this says so rather than waiting for ever.
      const answered = new Promise<PacedResponse[]>((resolve, reject) => {
        child.once('message', resolve)
        // 'close' comes after every message the channel carried: a reject then changes nothing
        // once the answer arrived.
        child.once('close', () => reject(new Error('the paced sender ended before answering')))
      })
      if (child.connected) child.send('stop')
      responses.push(...(await answered))
      await exited
    },
  }
}

/** The `q` quantile of `samples` (nearest rank; 1 is the largest). */
export function percentile(samples: number[], q: number) {
  const sorted = [...samples].sort((a, b) => a - b)
  return sorted[Math.min(sorted.length - 1, Math.floor(q * sorted.length))]!
}

/** The 99th percentile of `samples`. */
export const p99 = (samples: number[]) => percentile(samples, 0.99)

/** A stretch of a benchmark run, on `clock()`. */
export interface Window {
  from: number
  to: number
}

/** The paced checks in flight at any moment of one of `windows`, their times in ms. */
export const within = (checks: Paced, windows: Window[]) =>
  checks.responses
    .filter((r) => windows.some((w) => r.at >= w.from && r.at - r.ms <= w.to))
    .map((r) => r.ms)

/**
 * Starts a worker process (`server/worker.ts`), as production runs it apart from the web
 * processes, and resolves once it has started; `stop()` sends SIGTERM and waits for it to exit.
 */
export async function startWorker(env: Record<string, string>, publicUrl: string) {
  const worker = spawn(process.execPath, ['--import', 'tsx', 'server/worker.ts'], {
    env: { PATH: process.env.PATH ?? '', PUBLIC_URL: publicUrl, ...env },
    // With a channel to this process: should it end first, however it ends, the channel closes
    // and the worker stops by itself.
    stdio: ['ignore', 'pipe', 'inherit', 'ipc'],
    // In a session of its own, as a process manager starts it, so that it can lower its
    // autogroup (server/jobs/priority.ts).
    detached: true,
  })
  const exited = new Promise<void>((resolve) => worker.once('exit', () => resolve()))
  await new Promise<void>((resolve, reject) => {
    worker.once('exit', (code) => reject(new Error(`the worker exited (${code})`)))
    worker.stdout!.on('data', (chunk: Buffer) => {
      if (chunk.toString().includes('worker started')) resolve()
    })
  })
  return {
    async stop() {
      worker.kill('SIGTERM')
      await exited
    },
  }
}

/** Signs in at a running server and answers the session cookie to send along. */
export async function sessionCookie(url: string, email: string, password: string) {
  const signIn = await fetch(`${url}/api/auth/sign-in`, {
    method: 'POST',
    headers: { 'content-type': 'application/json' },
    body: JSON.stringify({ email, password }),
  })
  if (signIn.status !== 200) throw new Error(`sign-in of ${email} failed: ${signIn.status}`)
  return signIn.headers
    .getSetCookie()
    .map((c) => c.split(';')[0]!)
    .find((c) => c.startsWith('twofold_session='))!
}
