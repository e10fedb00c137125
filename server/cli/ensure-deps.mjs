// Installs the dependencies from the lock file when node_modules is missing or older than the
// lock file. Plain JavaScript: it runs before TypeScript tooling is installed.
import { spawnSync } from 'node:child_process'
import { existsSync, lstatSync, statSync } from 'node:fs'
import { fileURLToPath } from 'node:url'

const root = fileURLToPath(new URL('../..', import.meta.url))
const lock = `${root}/package-lock.json`
const installed = `${root}/node_modules/.package-lock.json`

const stale = !existsSync(installed) || statSync(installed).mtimeMs < statSync(lock).mtimeMs
// A linked node_modules belongs to another checkout (a git worktree sharing it): npm ci would
// empty the folder it points at under that checkout's feet. Its owner installs there.
const shared = lstatSync(`${root}/node_modules`, { throwIfNoEntry: false })?.isSymbolicLink()
if (stale && shared) {
  console.log(
    'node_modules is a link to another checkout and looks older than package-lock.json: ' +
      'not installing here (run `npm ci` in the checkout it points at if a dependency changed).',
  )
} else if (stale) {
  console.log('Installing dependencies from package-lock.json (npm ci)…')
  const result = spawnSync('npm', ['ci', '--no-audit', '--no-fund'], {
    cwd: root,
    stdio: 'inherit',
  })
  if (result.status !== 0) {
    console.error('npm ci failed: see the messages above.')
    process.exit(result.status ?? 1)
  }
}
