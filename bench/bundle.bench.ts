import { execFileSync } from 'node:child_process'
import { existsSync } from 'node:fs'
import { get } from 'node:http'
import type { AddressInfo } from 'node:net'
import { join } from 'node:path'
import { projectDir } from '../server/paths.ts'
import { benchApp, withBenchDatabase } from './harness.ts'
import { signInFiles } from './sign-in-bytes.ts'

/** The budget of the sign-in page's scripts and styles, compressed as the server sends them. */
export const signInBudgetBytes = 150 * 1024

/** The bytes of one answer as they travel (not decompressed), and the encoding it came in. */
function fetchRaw(url: string) {
  return new Promise<{ bytes: number; encoding: string }>((resolve, reject) => {
    // What Chromium asks for.
    get(url, { headers: { 'accept-encoding': 'gzip, deflate, br, zstd' } }, (res) => {
      let bytes = 0
      res.on('data', (chunk: Buffer) => (bytes += chunk.length))
      res.on('end', () => resolve({ bytes, encoding: res.headers['content-encoding'] ?? 'none' }))
      res.on('error', reject)
    }).on('error', reject)
  })
}

/**
 * The compressed JavaScript and CSS of the sign-in page, fetched from the app serving the client
 * build (built first when there is none), against the 150 KB budget.
 */
export default async function bundleBench() {
  const distDir = join(projectDir, 'dist')
  if (!existsSync(join(distDir, '.vite', 'manifest.json'))) {
    execFileSync('npx', ['vite', 'build'], { cwd: projectDir, stdio: 'inherit' })
  }
  await withBenchDatabase(async (database) => {
    const { app, mailer } = await benchApp(database, distDir)
    const server = app.listen(0, '127.0.0.1')
    await new Promise((resolve) => server.once('listening', resolve))
    const { port } = server.address() as AddressInfo
    try {
      const files = signInFiles(distDir)
      let total = 0
      for (const file of files) {
        const { bytes } = await fetchRaw(`http://127.0.0.1:${port}/${file}`)
        total += bytes
      }
      console.log('\nSign-in page: JavaScript and CSS as served (compressed)')
      console.log(
        `  measured:  ${total} bytes (${(total / 1024).toFixed(1)} KB) in ${files.length} files`,
      )
      console.log(`  baseline (budget): ${signInBudgetBytes} bytes (150.0 KB)`)
      console.log(`  ratio: ${(total / signInBudgetBytes).toFixed(2)}×`)
    } finally {
      server.close()
      await mailer.close()
    }
  })
}
