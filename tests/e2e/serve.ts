import { existsSync } from 'node:fs'
import { createServer } from 'node:net'
import { join } from 'node:path'
import { parseEnv } from '../../server/env.ts'
import { defaultClientDir, serve } from '../../server/index.ts'
import { prepareDatabase } from '../../server/cli/bootstrap.ts'
import { localClipStorage } from '../../server/cli/fake-s3.ts'
import { createClipStore } from '../../server/storage/clip-store.ts'
import {
  clusterUrl,
  ensureDatabase,
  removeCluster,
  startCluster,
  throwawayCluster,
} from '../../server/cli/postgres.ts'

// The server of the browser tests: the production build over a throwaway cluster holding the
// demo club, never the `npm start` data. Stops and removes the cluster on SIGTERM.
if (!existsSync(join(defaultClientDir, 'index.html'))) {
  console.error('No client build in dist/: run `npm run build` first.')
  process.exit(1)
}
// The app's port is held from the start until the app listens on it: the cluster, the clip store
// and the mail fakes below take free ports of their own, and could otherwise be handed this one.
// A connection meanwhile (Playwright asking whether the server is up) is closed at once: not up.
const port = Number(process.env.E2E_PORT ?? 3100)
const reservation = createServer((socket) => socket.destroy())
await new Promise<void>((resolve, reject) => {
  reservation.once('error', reject)
  reservation.listen(port, '127.0.0.1', resolve)
})
const cluster = await throwawayCluster('twofold-e2e-')
startCluster(cluster)
await ensureDatabase(cluster, 'twofold_e2e')
const url = clusterUrl(cluster, 'twofold_e2e')
// Clips in a local S3 fake over a temporary folder, removed on the way out.
const storage = await localClipStorage(
  parseEnv({
    ...process.env,
    PORT: String(port),
    LOG_LEVEL: 'warn',
    DATABASE_URL: url,
  }),
)
const env = storage.env
await prepareDatabase(url, { clips: createClipStore(env) })
await new Promise<void>((resolve) => reservation.close(() => resolve()))
const serving = await serve({ ...env, NODE_ENV: 'test' }, { worker: true })
console.log(`e2e server on ${serving.url}`)

let stopping = false
async function stop() {
  if (stopping) return
  stopping = true
  await serving.close()
  await storage.fake?.close()
  removeCluster(cluster)
  process.exit(0)
}
process.on('SIGTERM', () => void stop())
process.on('SIGINT', () => void stop())
