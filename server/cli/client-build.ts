import { existsSync, readdirSync, statSync } from 'node:fs'
import { join, relative } from 'node:path'

/** Everything the client build is made from; a change to any of them calls for a new build. */
export const clientSources = [
  'src',
  'shared',
  'public',
  'index.html',
  'vite.config.ts',
  'package-lock.json',
]

export interface ClientBuildCheck {
  build: boolean
  /** Why, in words for the person watching `npm start`. */
  reason: string
}

function newestSource(projectDir: string): { path: string; mtimeMs: number } | undefined {
  let newest: { path: string; mtimeMs: number } | undefined
  const consider = (path: string) => {
    const { mtimeMs } = statSync(path)
    if (!newest || mtimeMs > newest.mtimeMs) newest = { path, mtimeMs }
  }
  for (const source of clientSources) {
    const path = join(projectDir, source)
    if (!existsSync(path)) continue
    if (!statSync(path).isDirectory()) {
      consider(path)
      continue
    }
    for (const entry of readdirSync(path, { recursive: true, withFileTypes: true })) {
      if (entry.isFile()) consider(join(entry.parentPath, entry.name))
    }
  }
  return newest && { ...newest, path: relative(projectDir, newest.path) }
}

/**
 * Whether `npm start` must build the client: when dist/ holds no build, or when a source of it
 * changed after the build was made (a newer modification time than dist/index.html).
 */
export function checkClientBuild(projectDir: string): ClientBuildCheck {
  const built = join(projectDir, 'dist', 'index.html')
  if (!existsSync(built)) return { build: true, reason: 'dist/ holds no client build yet' }
  const newest = newestSource(projectDir)
  if (newest && newest.mtimeMs > statSync(built).mtimeMs)
    return { build: true, reason: `${newest.path} changed since the last build` }
  return {
    build: false,
    reason: 'dist/ is up to date (nothing it is built from changed since)',
  }
}
