import { spawn } from 'node:child_process'
import { setPriority } from 'node:os'
import { and, eq } from 'drizzle-orm'
import { hashPassword } from '../server/auth/password.ts'
import { users } from '../server/db/schema-accounts.ts'
import { auditRuns } from '../server/db/schema-audits.ts'
import { auditBenchAsOf, buildAuditClub } from './audit.bench.ts'
import { clock } from './clock.ts'
import { withBenchDatabase } from './harness.ts'
import {
  appEnvironment,
  p99,
  paced,
  percentile,
  sessionCookie,
  startServer,
  startWorker,
  within,
  type Window,
} from './load.ts'

const password = 'bench-isolation-2026'
/** Enough audits that the busy p99 stands on a few dozen checks, not a handful. */
const audits = 16
/** A steady trickle of health checks, as monitoring and a few people would send. */
const perSecond = 200
const idleMs = 1500

/**
 * A process that keeps one core busy at the lowest priority a process can give itself: its
 * thread and, leading a session of its own, its autogroup (server/jobs/priority.ts), asked for
 * until the kernel takes it (one change a tenth of a second); it says so should it not.
 */
const spinner = (ms: number) => `
  require('node:os').setPriority(19)
  for (let tries = 0; ; tries++) {
    try { require('node:fs').writeFileSync('/proc/self/autogroup', '19'); break } catch (err) {
      if (err.code !== 'EAGAIN' || tries === 30) {
        console.error('the control loop runs without its autogroup lowered: ' + err.message)
        break
      }
      Atomics.wait(new Int32Array(new SharedArrayBuffer(4)), 0, 0, 100)
    }
  }
  const end = Date.now() + ${Math.ceil(ms)}
  while (Date.now() < end) {}
`

const sleep = (ms: number) => new Promise((resolve) => setTimeout(resolve, ms))

/**
 * `/api/health` on a web process (target: p99 at most 2× idle) while a worker, in a process of
 * its own as production runs it, computes audits of a club of 1,000 athletes × 300 elements
 * asked for through the API; against the same checks, sent at the same steady rate, while the
 * worker is idle.
 */
export default async function isolationBench() {
  await withBenchDatabase(async (database) => {
    const db = database.db
    const { access } = await buildAuditClub(db)
    await db
      .update(users)
      .set({ passwordHash: await hashPassword(password) })
      .where(eq(users.id, access.userId))
    const env = appEnvironment(database.url)
    const web = await startServer('app', env)
    const worker = await startWorker(env, web.url)
    try {
      const cookie = await sessionCookie(web.url, 'audit@bench.invalid', password)

      const checks = await paced(`${web.url}/api/health`, perSecond)
      await sleep(3000)
      // Idle stretches and audits take turns, so that both see the same weather on the machine.
      const idle: Window[] = []
      const busy: Window[] = []
      for (let i = 0; i < audits; i++) {
        const from = clock()
        await sleep(idleMs)
        idle.push({ from, to: clock() })
        const res = await fetch(`${web.url}/api/clubs/${access.clubId}/audits`, {
          method: 'POST',
          headers: { 'content-type': 'application/json', cookie },
          body: JSON.stringify({ squadId: null, asOf: auditBenchAsOf }),
        })
        if (res.status !== 202) throw new Error(`audit not accepted: ${res.status}`)
        const { id } = (await res.json()) as { id: string }
        let started = 0
        for (;;) {
          const [run] = await db
            .select({ status: auditRuns.status, phase: auditRuns.phase })
            .from(auditRuns)
            .where(and(eq(auditRuns.clubId, access.clubId), eq(auditRuns.id, id)))
          if (!started && run!.phase !== 'queued') started = clock()
          if (run!.status === 'failed') throw new Error('the audit failed')
          if (run!.status === 'done') {
            busy.push({ from: started, to: clock() })
            break
          }
          await sleep(20)
        }
        // The worker settles (its last writes, a collection) before the next idle stretch.
        await sleep(500)
      }
      // The control: a busy loop at the lowest priority, with no database and no audit, for as
      // long as the audits ran, in turns with idle stretches. What it costs the checks is the
      // machine's own share of a second core being busy at all, beside the audit's.
      const control: Window[] = []
      const controlIdle: Window[] = []
      for (const w of busy) {
        const from = clock()
        await sleep(idleMs)
        controlIdle.push({ from, to: clock() })
        // The loop ends by itself shortly after its stretch, should this process die first.
        const loop = spawn(process.execPath, ['-e', spinner(w.to - w.from + 1000)], {
          stdio: ['ignore', 'ignore', 'inherit'],
          detached: true,
        })
        loop.on('error', (err) => console.error(`the control loop did not start: ${err.message}`))
        try {
          // Lowered from here too, so that it is low from its first instant.
          if (loop.pid) setPriority(loop.pid, 19)
          const started = clock()
          await sleep(w.to - w.from)
          control.push({ from: started, to: clock() })
        } finally {
          loop.kill('SIGKILL')
        }
        await sleep(500)
      }
      await checks.stop()

      const failed = checks.responses.filter((r) => r.status !== 200).length
      if (failed) throw new Error(`${failed} health checks did not answer 200`)
      const idleMs99 = p99(within(checks, idle))
      const busyMs99 = p99(within(checks, busy))
      const controlMs99 = p99(within(checks, control))
      const controlIdleMs99 = p99(within(checks, controlIdle))
      const seconds = busy.map((w) => ((w.to - w.from) / 1000).toFixed(1)).join(', ')
      console.log(`\nGET /api/health on the web process, ${perSecond} checks a second`)
      console.log(
        `  while ${audits} audits of 1,000 × 300 ran on a worker process (${seconds} s): p99 ${busyMs99.toFixed(1)} ms (${within(checks, busy).length} checks)`,
      )
      console.log(
        `  baseline (the worker idle, in between): p99 ${idleMs99.toFixed(1)} ms (${within(checks, idle).length} checks)`,
      )
      console.log(`  ratio (p99): ${(busyMs99 / idleMs99).toFixed(2)}×`)
      console.log(
        `  control, a busy loop at niceness 19 in a session of its own (autogroup at 19) instead of the audits: p99 ${controlMs99.toFixed(1)} ms against ${controlIdleMs99.toFixed(1)} ms idle, ${(controlMs99 / controlIdleMs99).toFixed(2)}×`,
      )
      const spread = (w: Window[]) => {
        const at = (q: number) => percentile(within(checks, w), q).toFixed(1)
        return `p50 ${at(0.5)}, p90 ${at(0.9)}, p99 ${at(0.99)}, worst ${at(1)} ms`
      }
      console.log(`  audits: ${spread(busy)}; idle: ${spread(idle)}`)
    } finally {
      await Promise.all([web.stop(), worker.stop()])
    }
  })
}
