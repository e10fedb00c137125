import { existsSync } from 'node:fs'
import { dirname, join } from 'node:path'
import { fileURLToPath } from 'node:url'

/**
 * The nearest folder above `moduleUrl` that holds package.json. A module runs from its source
 * (server/…) and compiled (build/server/…), one folder deeper, so paths to the project's own
 * folders start from here rather than from a fixed number of `..`.
 */
export function findProjectDir(moduleUrl: string): string {
  const start = dirname(fileURLToPath(moduleUrl))
  for (let dir = start; ; dir = dirname(dir)) {
    if (existsSync(join(dir, 'package.json'))) return dir
    if (dirname(dir) === dir) throw new Error(`No package.json in ${start} or any folder above it.`)
  }
}

/** The checkout: where package.json, drizzle/ (migrations) and dist/ (the built client) are. */
export const projectDir = findProjectDir(import.meta.url)
