import { spawn, spawnSync } from 'node:child_process'
import { existsSync, readFileSync } from 'node:fs'
import { join } from 'node:path'
import { expect, test } from '@playwright/test'
import { prepareDatabase } from '../../server/cli/bootstrap.ts'
import {
  clusterUrl,
  ensureDatabase,
  freePort,
  removeCluster,
  startCluster,
  throwawayCluster,
} from '../../server/cli/postgres.ts'
import { startFakeSmtp } from '../../server/mail/fake-smtp.ts'
import { projectDir } from '../../server/paths.ts'
import { demoPassword, demoPeople } from '../../seed/demo.ts'

// The compiled server and migration command, as `npm run build` leaves them, run on plain node
// with nothing but the environment: no TypeScript loader, no demo, no local fakes of their own.

const compiledServer = 'build/server/index.js'
const compiledWorker = 'build/server/worker.js'
const compiledMigrate = 'build/server/cli/migrate.js'

/** Only what a production host would set: no NODE_OPTIONS, no loader inherited from the runner. */
function productionEnv(settings: Record<string, string>): NodeJS.ProcessEnv {
  return { PATH: process.env.PATH, HOME: process.env.HOME, NODE_ENV: 'production', ...settings }
}

function runNode(args: string[], env: NodeJS.ProcessEnv) {
  return spawnSync(process.execPath, args, { cwd: projectDir, env, encoding: 'utf8' })
}

test('npm run build compiles the server without the demo', () => {
  expect(existsSync(join(projectDir, compiledServer))).toBe(true)
  expect(existsSync(join(projectDir, 'build/server/services/report-pdf.worker.js'))).toBe(true)
  expect(existsSync(join(projectDir, 'build/seed'))).toBe(false)
  expect(existsSync(join(projectDir, 'build/server/cli/start.js'))).toBe(false)
})

test('the compiled server refuses to start in production without PUBLIC_URL, naming it', () => {
  const run = runNode(
    [compiledServer],
    productionEnv({
      DATABASE_URL: 'postgres://twofold@127.0.0.1:9/twofold',
      SMTP_URL: 'smtp://127.0.0.1:9',
    }),
  )
  expect(run.status).not.toBe(0)
  expect(run.stderr).toContain('PUBLIC_URL: required in production')
  expect(run.stderr).not.toContain('DATABASE_URL')
})

test('npm run serve is production mode whatever NODE_ENV says', () => {
  const run = spawnSync('npm', ['run', '--silent', 'serve'], {
    cwd: projectDir,
    env: { PATH: process.env.PATH, HOME: process.env.HOME, NODE_ENV: 'development' },
    encoding: 'utf8',
  })
  expect(run.status).not.toBe(0)
  for (const name of ['DATABASE_URL', 'PUBLIC_URL', 'SMTP_URL'])
    expect(run.stderr).toContain(`${name}: required in production`)
})

test('the compiled migration command needs DATABASE_URL in production', () => {
  const run = runNode([compiledMigrate], productionEnv({}))
  expect(run.status).not.toBe(0)
  expect(run.stderr).toContain('DATABASE_URL: required in production')
})

test('migrated and served compiled: health, the client, a PDF drawn on its worker, a worker process, SIGTERM', async () => {
  test.setTimeout(180_000)
  const cluster = await throwawayCluster('twofold-production-')
  const smtp = await startFakeSmtp()
  let server: ReturnType<typeof spawn> | undefined
  try {
    startCluster(cluster)
    await ensureDatabase(cluster, 'twofold')
    const databaseUrl = clusterUrl(cluster, 'twofold')

    // The release step, through the npm script a platform runs.
    const migrate = spawnSync('npm', ['run', '--silent', 'db:migrate'], {
      cwd: projectDir,
      env: productionEnv({ DATABASE_URL: databaseUrl }),
      encoding: 'utf8',
    })
    expect(migrate.stderr).toBe('')
    expect(migrate.stdout).toContain('Migrations applied.')
    expect(migrate.status).toBe(0)
    // A club to read a report of (production never seeds: the test loads it itself).
    const seeded = await prepareDatabase(databaseUrl, { today: new Date('2026-12-01T12:00:00Z') })
    expect(seeded).not.toBeNull()

    const port = await freePort()
    const base = `http://127.0.0.1:${port}`
    server = spawn(process.execPath, [compiledServer], {
      cwd: projectDir,
      env: productionEnv({
        DATABASE_URL: databaseUrl,
        PUBLIC_URL: base,
        SMTP_URL: `smtp://127.0.0.1:${smtp.port}`,
        S3_BUCKET: 'twofold-clips',
        PORT: String(port),
        LOG_LEVEL: 'info',
      }),
      stdio: ['ignore', 'pipe', 'pipe'],
    })
    let output = ''
    server.stdout!.on('data', (chunk: Buffer) => (output += chunk))
    server.stderr!.on('data', (chunk: Buffer) => (output += chunk))
    const exited = new Promise<number | null>((resolve) => server!.on('exit', resolve))
    await expect
      .poll(() => output, { timeout: 30_000, message: 'the server says it is serving' })
      .toContain('Twofold is serving on')

    // Plain node: the command line holds no loader and the environment no NODE_OPTIONS.
    const cmdline = readFileSync(`/proc/${server.pid}/cmdline`, 'utf8').split('\0').filter(Boolean)
    expect(cmdline).toEqual([process.execPath, compiledServer])
    const environ = readFileSync(`/proc/${server.pid}/environ`, 'utf8').split('\0')
    expect(environ.filter((line) => line.startsWith('NODE_OPTIONS='))).toEqual([])

    const health = await fetch(`${base}/api/health`)
    expect(health.status).toBe(200)
    expect(await health.json()).toEqual({ status: 'ok', database: 'up' })

    const page = await fetch(`${base}/squads`)
    expect(page.status).toBe(200)
    expect(await page.text()).toBe(readFileSync(join(projectDir, 'dist/index.html'), 'utf8'))

    const director = demoPeople.find((p) => p.role === 'director')!
    const signIn = await fetch(`${base}/api/auth/sign-in`, {
      method: 'POST',
      headers: { 'Content-Type': 'application/json' },
      body: JSON.stringify({ email: director.email, password: demoPassword }),
    })
    expect(signIn.status).toBe(200)
    const cookie = signIn.headers
      .getSetCookie()
      .map((c) => c.split(';')[0])
      .join('; ')
    const { activeClubId } = (await signIn.json()) as { activeClubId: string }
    const audits = (await (
      await fetch(`${base}/api/clubs/${activeClubId}/audits`, { headers: { cookie } })
    ).json()) as { id: string }[]
    expect(audits.length).toBeGreaterThan(0)
    // A compiled worker does the audits and the PDF reports, and sends the mail the web process
    // queued.
    const worker = spawn(process.execPath, [compiledWorker], {
      cwd: projectDir,
      env: productionEnv({
        DATABASE_URL: databaseUrl,
        PUBLIC_URL: base,
        SMTP_URL: `smtp://127.0.0.1:${smtp.port}`,
        S3_BUCKET: 'twofold-clips',
      }),
      stdio: ['ignore', 'ignore', 'inherit'],
    })
    const workerExited = new Promise<number | null>((resolve) => worker.on('exit', resolve))
    try {
      const started = await fetch(`${base}/api/clubs/${activeClubId}/audits`, {
        method: 'POST',
        headers: { cookie, 'Content-Type': 'application/json' },
        body: JSON.stringify({ squadId: null }),
      })
      expect(started.status).toBe(202)
      const { id: runId } = (await started.json()) as { id: string }
      await expect
        .poll(
          async () =>
            (
              (await (
                await fetch(`${base}/api/clubs/${activeClubId}/audit-jobs/${runId}`, {
                  headers: { cookie },
                })
              ).json()) as { status: string }
            ).status,
          { timeout: 30_000 },
        )
        .toBe('done')
      // The PDF report too, drawn on the compiled drawing thread of the worker.
      const asked = await fetch(
        `${base}/api/clubs/${activeClubId}/audits/${audits[0]!.id}/report-pdfs`,
        { method: 'POST', headers: { cookie } },
      )
      expect(asked.status).toBe(202)
      const { id: pdfId } = (await asked.json()) as { id: string }
      const pdfUrl = `${base}/api/clubs/${activeClubId}/report-pdfs/${pdfId}`
      await expect
        .poll(
          async () =>
            ((await (await fetch(pdfUrl, { headers: { cookie } })).json()) as { status: string })
              .status,
          { timeout: 30_000 },
        )
        .toBe('done')
      const pdf = await fetch(`${pdfUrl}/download`, { headers: { cookie } })
      expect(pdf.status).toBe(200)
      const bytes = Buffer.from(await pdf.arrayBuffer())
      expect(bytes.subarray(0, 5).toString('latin1')).toBe('%PDF-')
      const reset = await fetch(`${base}/api/auth/password-reset/request`, {
        method: 'POST',
        headers: { 'Content-Type': 'application/json' },
        body: JSON.stringify({ email: director.email }),
      })
      expect(reset.status).toBe(202)
      const mail = await smtp.waitFor(director.email, 20_000)
      expect(mail.text).toContain(`${base}/reset-password#token=`)
    } finally {
      worker.kill('SIGTERM')
    }
    expect(await workerExited).toBe(0)

    server.kill('SIGTERM')
    expect(await exited).toBe(0)
    expect(output).toContain('SIGTERM received')
    server = undefined
  } finally {
    server?.kill('SIGKILL')
    await smtp.close()
    removeCluster(cluster)
  }
})
