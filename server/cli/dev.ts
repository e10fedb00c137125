import { join } from 'node:path'
import { createServer } from 'vite'
import { createClipStore } from '../storage/clip-store.ts'
import { localClipStorage } from './fake-s3.ts'
import { EnvError, parseEnv } from '../env.ts'
import { serve, stopOnSignals } from '../index.ts'
import { localDatabase, prepareLocalDatabase, projectDir } from './bootstrap.ts'
import { printDemoSignIns } from './demo-sign-ins.ts'
import { PostgresSetupError, stopCluster } from './postgres.ts'

// `npm run dev`: the API on PORT (default 3000) and Vite with hot reload on VITE_PORT (default
// 5173), which proxies /api to the API and keeps the Host header.
try {
  // Clips go to the settings' bucket, else to a local S3 fake keeping them in .data/s3.
  const storage = await localClipStorage(parseEnv(), join(projectDir, '.data', 's3'))
  const env = storage.env
  const local = await localDatabase(env.DATABASE_URL)
  const { refused } = await prepareLocalDatabase(local, env, { clips: createClipStore(env) })
  if (refused) console.log(refused)
  // People open Vite's address, so links in mail point there, not at the API's own port.
  const publicUrl = env.PUBLIC_URL ?? `http://127.0.0.1:${Number(process.env.VITE_PORT ?? 5173)}`
  const api = await serve(
    { ...env, DATABASE_URL: local.url, PUBLIC_URL: publicUrl },
    { clientDir: '', worker: true },
  )
  process.env.TWOFOLD_API_URL = api.url
  const vite = await createServer({ root: projectDir, configFile: `${projectDir}/vite.config.ts` })
  await vite.listen()
  vite.printUrls()
  console.log(`API on ${api.url}`)
  if (api.mailViewerUrl) console.log(`Local mail viewer on ${api.mailViewerUrl}`)
  if (!refused) printDemoSignIns()
  stopOnSignals(api, async () => {
    await vite.close()
    await storage.fake?.close()
    if (local.cluster) stopCluster(local.cluster)
  })
} catch (err) {
  if (err instanceof EnvError || err instanceof PostgresSetupError) console.error(err.message)
  else console.error(err)
  process.exit(1)
}
