import { spawn, type ChildProcess } from 'node:child_process'
import { existsSync, readdirSync, readFileSync } from 'node:fs'
import { and, eq } from 'drizzle-orm'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { freePort } from '../../server/cli/postgres.ts'
import type { Database } from '../../server/db/client.ts'
import { clubs, mailOutbox } from '../../server/db/schema-accounts.ts'
import { auditRuns, audits } from '../../server/db/schema-audits.ts'
import { startFakeSmtp, type FakeSmtp } from '../../server/mail/fake-smtp.ts'
import { demoPassword, demoPeople, seedDemo } from '../../seed/demo.ts'
import { freshDatabase } from '../support/database.ts'

// Several processes over one database, as production runs them: two web processes and the
// workers, each a real `node` process started from the server's entry points.

let database: Database & { url: string }
let smtp: FakeSmtp
let clubId: string
const children: ChildProcess[] = []

const director = demoPeople.find((p) => p.role === 'director')!.email

function environment(extra: Record<string, string> = {}) {
  return {
    PATH: process.env.PATH ?? '',
    NODE_ENV: 'test',
    LOG_LEVEL: 'warn',
    DATABASE_URL: database.url,
    SMTP_URL: `smtp://127.0.0.1:${smtp.port}`,
    JOB_POLL_SECONDS: '0.5',
    JOB_MAINTENANCE_SECONDS: '1',
    JOB_AUDIT_TIMEOUT_SECONDS: '3',
    ...extra,
  }
}

function start(entry: 'server/index.ts' | 'server/worker.ts', env: Record<string, string>) {
  const child = spawn(process.execPath, ['--import', 'tsx', entry], {
    env,
    // A worker leads a session of its own, as a service manager starts one (see below), with a
    // channel to this process that stops it should the test run be cut short.
    stdio: [
      'ignore',
      'ignore',
      'inherit',
      ...(entry === 'server/worker.ts' ? ['ipc' as const] : []),
    ],
    detached: entry === 'server/worker.ts',
  })
  children.push(child)
  return child
}

async function webProcess() {
  const port = await freePort()
  start('server/index.ts', environment({ PORT: String(port), HOST: '127.0.0.1' }))
  const url = `http://127.0.0.1:${port}`
  // Started when its health check answers (beforeAll has no expect.poll).
  for (let i = 0; i < 200; i++) {
    const status = await fetch(`${url}/api/health`).then(
      (r) => r.status,
      () => 0,
    )
    if (status === 200) break
    await new Promise((r) => setTimeout(r, 100))
  }
  return url
}

const workerProcess = () => start('server/worker.ts', environment())

async function signIn(url: string, email: string, password = demoPassword) {
  const res = await fetch(`${url}/api/auth/sign-in`, {
    method: 'POST',
    headers: { 'content-type': 'application/json' },
    body: JSON.stringify({ email, password }),
  })
  const cookie = res.headers
    .getSetCookie()
    .map((c) => c.split(';')[0]!)
    .find((c) => c.startsWith('twofold_session='))
  return { status: res.status, cookie }
}

const stopped = (child: ChildProcess) =>
  new Promise<void>((resolve) =>
    child.exitCode !== null ? resolve() : child.once('exit', () => resolve()),
  )

beforeAll(async () => {
  database = await freshDatabase()
  smtp = await startFakeSmtp()
  await seedDemo(database.db)
  clubId = (await database.db.select({ id: clubs.id }).from(clubs))[0]!.id
}, 60_000)

afterAll(async () => {
  for (const child of children) if (child.exitCode === null) child.kill('SIGKILL')
  await Promise.all(children.map(stopped))
  await smtp.close()
  await database.close()
})

describe('two web processes and workers over one database', () => {
  let a: string
  let b: string
  let worker: ChildProcess

  beforeAll(async () => {
    ;[a, b] = await Promise.all([webProcess(), webProcess()])
    worker = workerProcess()
  }, 60_000)

  it('computes an audit started through one process and polled through the other', async () => {
    const { cookie } = await signIn(a, director)
    const started = await fetch(`${a}/api/clubs/${clubId}/audits`, {
      method: 'POST',
      headers: { 'content-type': 'application/json', cookie: cookie! },
      body: JSON.stringify({ squadId: null }),
    })
    expect(started.status).toBe(202)
    const run = (await started.json()) as { id: string }
    const other = await signIn(b, director)
    const poll = async () => {
      const res = await fetch(`${b}/api/clubs/${clubId}/audit-jobs/${run.id}`, {
        headers: { cookie: other.cookie! },
      })
      return (await res.json()) as { status: string; auditId: string | null }
    }
    await expect.poll(async () => (await poll()).status, { timeout: 30_000 }).toBe('done')
    const { auditId } = await poll()
    const stored = await database.db
      .select({ id: audits.id })
      .from(audits)
      .where(and(eq(audits.clubId, clubId), eq(audits.id, auditId!)))
    expect(stored).toHaveLength(1)
  }, 60_000)

  // Linux keeps a niceness per thread (setpriority(2), "BUGS"); proc(5) gives each thread's
  // niceness in field 19 of /proc/<pid>/task/<tid>/stat. The worker asks for niceness 10
  // (server/worker.ts): every thread must have it, the garbage collector's and libuv's pool
  // (which hashes the audit) included, not only the main thread.
  it.runIf(process.platform === 'linux')(
    'runs every thread of a worker at its lower priority',
    () => {
      const niceness = (tid: string) => {
        const stat = readFileSync(`/proc/${worker.pid}/task/${tid}/stat`, 'utf8')
        // Fields after the command name, which is in parentheses and may hold spaces.
        return Number(stat.slice(stat.lastIndexOf(')') + 2).split(' ')[16])
      }
      const threads = readdirSync(`/proc/${worker.pid}/task`)
      expect(threads.length).toBeGreaterThan(1)
      expect(threads.map(niceness)).toEqual(threads.map(() => 10))
    },
  )

  // sched(7), "The autogroup feature": where the kernel groups processes by session, the CPU is
  // shared between the groups first and a niceness ranks threads inside one group only; the
  // group's own niceness is read and set through /proc/<pid>/autogroup ("/autogroup-N nice K").
  // A worker leading a session of its own must lower its group too, or its busy core counts as
  // much as PostgreSQL's serving the web processes.
  const autogroups =
    process.platform === 'linux' &&
    existsSync('/proc/sys/kernel/sched_autogroup_enabled') &&
    readFileSync('/proc/sys/kernel/sched_autogroup_enabled', 'utf8').trim() === '1'
  it.runIf(autogroups)(
    'lowers the autogroup of a worker leading a session of its own',
    async () => {
      await expect
        .poll(() => readFileSync(`/proc/${worker.pid}/autogroup`, 'utf8'), { timeout: 20_000 })
        .toMatch(/ nice 10$/m)
    },
  )

  it.runIf(autogroups)(
    'leaves alone the autogroup of a session it does not lead, as under a shell',
    async () => {
      // A session whose first process, like a shell or `npm run worker`, starts a process that
      // tries to lower the session's group: it must leave it, or the shell and all it starts
      // afterwards would run lower too.
      const trying = `import('./server/jobs/priority.ts').then((m) => console.log(m.lowerAutogroupPriority(10)))`
      const session = `
        const outcome = require('node:child_process').execFileSync(process.execPath, ['--import', 'tsx', '-e', ${JSON.stringify(trying)}])
        const group = require('node:fs').readFileSync('/proc/self/autogroup', 'utf8')
        console.log(JSON.stringify({ outcome: outcome.toString().trim(), group: group.trim() }))
      `
      const child = spawn(process.execPath, ['-e', session], {
        detached: true,
        stdio: ['ignore', 'pipe', 'inherit'],
      })
      children.push(child)
      let out = ''
      child.stdout!.on('data', (chunk: Buffer) => (out += chunk.toString()))
      await new Promise((resolve) => child.once('exit', resolve))
      const { outcome, group } = JSON.parse(out) as { outcome: string; group: string }
      expect(outcome).toBe('shared')
      expect(group).toMatch(/ nice 0$/)
    },
    30_000,
  )

  it('holds the sign-in limits across both processes', async () => {
    const victim = demoPeople.find((p) => p.role === 'board')!.email
    const statuses: number[] = []
    for (let i = 0; i < 6; i++) statuses.push((await signIn(i % 2 ? b : a, victim, `x${i}`)).status)
    expect(statuses).toEqual([401, 401, 401, 401, 401, 429])
  })

  it('delivers each mail once, sent by a worker', async () => {
    const person = demoPeople.find((p) => p.role === 'clinician')!.email
    const before = smtp.messages().filter((m) => m.to.includes(person)).length
    const res = await fetch(`${b}/api/auth/password-reset/request`, {
      method: 'POST',
      headers: { 'content-type': 'application/json' },
      body: JSON.stringify({ email: person }),
    })
    expect(res.status).toBe(202)
    // Once the outbox says it was sent, the mail server has it, once; its text is gone.
    await expect
      .poll(
        async () =>
          (await database.db.select().from(mailOutbox).where(eq(mailOutbox.to, person)))[0]
            ?.sentAt ?? null,
        { timeout: 20_000 },
      )
      .not.toBeNull()
    expect(smtp.messages().filter((m) => m.to.includes(person))).toHaveLength(before + 1)
    const [row] = await database.db.select().from(mailOutbox).where(eq(mailOutbox.to, person))
    expect(row!.text).toBeNull()
  }, 40_000)

  it('stores exactly one audit when the worker computing it stops dead', async () => {
    const counts = async (): Promise<[number, number]> => [
      (await database.db.select({ id: audits.id }).from(audits).where(eq(audits.clubId, clubId)))
        .length,
      (
        await database.db
          .select({ id: auditRuns.id })
          .from(auditRuns)
          .where(and(eq(auditRuns.clubId, clubId), eq(auditRuns.status, 'done')))
      ).length,
    ]
    const [auditsBefore, runsBefore] = await counts()
    const { cookie } = await signIn(a, director)
    // Freeze the worker in the middle of a run (tried again if a run finished too fast to
    // catch), let another worker take the run over, then let the first one go on.
    let runId = ''
    for (let attempt = 0; attempt < 10 && !runId; attempt++) {
      const res = await fetch(`${a}/api/clubs/${clubId}/audits`, {
        method: 'POST',
        headers: { 'content-type': 'application/json', cookie: cookie! },
        body: JSON.stringify({ squadId: null }),
      })
      const { id } = (await res.json()) as { id: string }
      const where = and(eq(auditRuns.clubId, clubId), eq(auditRuns.id, id))
      for (let i = 0; i < 400; i++) {
        const [row] = await database.db.select().from(auditRuns).where(where)
        if (row!.status !== 'running') break
        if (row!.phase !== 'queued') {
          worker.kill('SIGSTOP')
          const [now] = await database.db.select().from(auditRuns).where(where)
          if (now!.status === 'running') runId = id
          else worker.kill('SIGCONT')
          break
        }
        await new Promise((r) => setTimeout(r, 5))
      }
    }
    expect(runId).not.toBe('')
    const second = workerProcess()
    const where = and(eq(auditRuns.clubId, clubId), eq(auditRuns.id, runId))
    await expect
      .poll(async () => (await database.db.select().from(auditRuns).where(where))[0]!.status, {
        timeout: 60_000,
        interval: 250,
      })
      .toBe('done')
    // The first worker wakes up and finishes its copy of the work: it must not store it again.
    worker.kill('SIGCONT')
    const [run] = await database.db.select().from(auditRuns).where(where)
    worker.kill('SIGTERM')
    await stopped(worker)
    second.kill('SIGTERM')
    await stopped(second)
    expect(run!.auditId).not.toBeNull()
    // One stored audit for each finished run: none stored twice.
    const [auditsAfter, runsAfter] = await counts()
    expect(auditsAfter - auditsBefore).toBe(runsAfter - runsBefore)
  }, 120_000)
})
