import { spawn, spawnSync } from 'node:child_process'
import { join } from 'node:path'
import { EnvError, parseEnv } from '../env.ts'
import { serve, stopOnSignals } from '../index.ts'
import { localDatabase, prepareLocalDatabase, projectDir } from './bootstrap.ts'
import { createClipStore } from '../storage/clip-store.ts'
import { checkClientBuild } from './client-build.ts'
import { localClipStorage, type FakeS3 } from './fake-s3.ts'
import { printDemoSignIns } from './demo-sign-ins.ts'
import { PostgresSetupError, stopCluster, type Cluster } from './postgres.ts'

// `npm start`: everything from a fresh clone to a served product, one step at a time.
let startedCluster: Cluster | undefined
let fakeS3: FakeS3 | undefined
try {
  // Clips go to the settings' bucket, else to a local S3 fake keeping them in .data/s3.
  const storage = await localClipStorage(parseEnv(), join(projectDir, '.data', 's3'))
  fakeS3 = storage.fake
  const env = storage.env
  console.log('1/4 Database…')
  const local = await localDatabase(env.DATABASE_URL)
  startedCluster = local.cluster
  console.log('2/4 Migrations and demo club…')
  const { seeded, refused } = await prepareLocalDatabase(local, env, {
    clips: createClipStore(env),
  })
  console.log(
    seeded
      ? `    loaded the demo club "${seeded.club.name}" (${seeded.squads} squads, ${seeded.athletes} athletes, ${seeded.audits} published quarterly audits)`
      : `    ${refused ?? 'data kept from the last run'}`,
  )
  const client = checkClientBuild(projectDir)
  console.log(`3/4 Client: ${client.reason}${client.build ? ': building it…' : ''}`)
  if (client.build) {
    const build = spawnSync(
      join(projectDir, 'node_modules/.bin/vite'),
      ['build', '--logLevel', 'warn'],
      { cwd: projectDir, stdio: 'inherit' },
    )
    if (build.status !== 0) throw new Error('vite build failed: see the messages above.')
  }
  console.log('4/4 Serving…')
  // The demo: local database and local fake mail, never production mode.
  const serving = await serve({ ...env, DATABASE_URL: local.url, NODE_ENV: 'development' })
  // Audits and mail are done by a worker process of their own, as in production, sending mail
  // through the local fake mail server of the web process. In a session of its own, it lowers
  // its CPU share against this process and PostgreSQL (server/jobs/priority.ts). Ctrl-C reaches
  // this process alone, which stops the worker; should this process end any other way (a closed
  // terminal, SIGKILL), the worker's channel to it closes and the worker stops by itself.
  const worker = spawn(
    process.execPath,
    ['--import', 'tsx', join(projectDir, 'server/worker.ts')],
    {
      cwd: projectDir,
      stdio: ['inherit', 'inherit', 'inherit', 'ipc'],
      env: {
        ...process.env,
        NODE_ENV: 'development',
        DATABASE_URL: local.url,
        ...(serving.fakeSmtpUrl ? { SMTP_URL: serving.fakeSmtpUrl } : {}),
        ...(fakeS3?.vars ?? {}),
      },
      detached: true,
    },
  )
  process.once('exit', () => {
    if (worker.exitCode === null) worker.kill('SIGTERM')
  })
  console.log(`\nTwofold is running at ${serving.url}  (Ctrl-C stops it)`)
  if (serving.mailViewerUrl) {
    console.log(
      `Mail is not delivered: read it in the local mail viewer at ${serving.mailViewerUrl}`,
    )
  }
  console.log()
  if (!refused) printDemoSignIns()
  stopOnSignals(serving, async () => {
    if (worker.exitCode === null) {
      worker.kill('SIGTERM')
      await new Promise((resolve) => worker.once('exit', resolve))
    }
    await fakeS3?.close()
    if (local.cluster) {
      console.log('Stopping PostgreSQL…')
      stopCluster(local.cluster)
    }
  })
} catch (err) {
  if (err instanceof EnvError || err instanceof PostgresSetupError) console.error(err.message)
  else console.error(err)
  if (startedCluster) stopCluster(startedCluster)
  await fakeS3?.close()
  process.exit(1)
}
