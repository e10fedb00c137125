import { spawn, spawnSync } from 'node:child_process'
import { existsSync, mkdtempSync, readFileSync, rmSync } from 'node:fs'
import { tmpdir } from 'node:os'
import { join } from 'node:path'
import { projectDir } from './bootstrap.ts'
import { findPostgresBin, freePort } from './postgres.ts'

// `npm test`: type-check, lint, the vitest projects, the production build and the browser tests,
// then one closing line `N passed, N failed` summed over all of them. Every runner that needs a
// database starts a throwaway cluster of its own; the `npm start` data is never touched.

interface StepResult {
  name: string
  passed: number
  failed: number
  seconds: number
}

const bin = (tool: string) => join(projectDir, 'node_modules/.bin', tool)
const reports = mkdtempSync(join(tmpdir(), 'twofold-reports-'))
const results: StepResult[] = []

function runStep(command: string, args: string[], env: NodeJS.ProcessEnv = {}): Promise<number> {
  return new Promise((resolve) => {
    const child = spawn(command, args, {
      cwd: projectDir,
      stdio: 'inherit',
      env: { ...process.env, ...env },
    })
    child.on('exit', (code, signal) => resolve(code ?? (signal ? 1 : 0)))
    child.on('error', () => resolve(127))
  })
}

async function check(name: string, command: string, args: string[]) {
  const start = Date.now()
  console.log(`\n▶ ${name}`)
  const code = await runStep(command, args)
  results.push({
    name,
    passed: code === 0 ? 1 : 0,
    failed: code === 0 ? 0 : 1,
    seconds: (Date.now() - start) / 1000,
  })
  return code === 0
}

function readJson(path: string): Record<string, unknown> | undefined {
  try {
    return JSON.parse(readFileSync(path, 'utf8')) as Record<string, unknown>
  } catch {
    return undefined
  }
}

function ensureChromium(): string | undefined {
  const path = process.env.CHROMIUM_PATH ?? '/usr/bin/chromium'
  if (existsSync(path)) return path
  if (process.getuid?.() !== 0) {
    console.error(
      'Chromium not found: install the Debian package "chromium" for the browser tests.',
    )
    return undefined
  }
  console.log("Installing Debian's Chromium for the browser tests…")
  const env = { ...process.env, DEBIAN_FRONTEND: 'noninteractive' }
  spawnSync('apt-get', ['update', '-qq'], { stdio: 'inherit', env })
  spawnSync('apt-get', ['install', '-y', '-qq', 'chromium'], { stdio: 'inherit', env })
  return existsSync(path) ? path : undefined
}

findPostgresBin()
const chromium = ensureChromium()

await check('type-check (vue-tsc -b)', bin('vue-tsc'), ['-b'])
await check('lint (eslint)', bin('eslint'), ['.', '--max-warnings', '0'])
await check('format (prettier --check)', bin('prettier'), ['--check', '.'])

{
  const start = Date.now()
  console.log('\n▶ vitest (shared, server, client)')
  const out = join(reports, 'vitest.json')
  const code = await runStep(bin('vitest'), [
    'run',
    '--reporter=default',
    '--reporter=json',
    `--outputFile.json=${out}`,
  ])
  const report = readJson(out)
  const passed = Number(report?.numPassedTests ?? 0)
  let failed = Number(report?.numFailedTests ?? 0)
  if (code !== 0 && failed === 0) failed = 1 // a runner or set-up error that failed no single test
  results.push({ name: 'vitest', passed, failed, seconds: (Date.now() - start) / 1000 })
}

// The production build, as `npm run build` makes it: the client into dist/, the server compiled
// into build/ (the browser tests run both, the compiled server on plain node).
const clientBuilt = await check('client build (vite build)', bin('vite'), [
  'build',
  '--logLevel',
  'warn',
])
rmSync(join(projectDir, 'build'), { recursive: true, force: true })
const serverBuilt = await check('server build (tsc)', bin('tsc'), ['-p', 'tsconfig.server.json'])
const built = clientBuilt && serverBuilt

{
  const start = Date.now()
  console.log('\n▶ browser tests (Playwright, Chromium)')
  if (!built || !chromium) {
    results.push({ name: 'playwright', passed: 0, failed: 1, seconds: 0 })
  } else {
    const out = join(reports, 'playwright.json')
    const code = await runStep(bin('playwright'), ['test'], {
      PLAYWRIGHT_JSON_OUTPUT_NAME: out,
      E2E_PORT: String(await freePort()),
      CHROMIUM_PATH: chromium,
    })
    const stats = (readJson(out)?.stats ?? {}) as Record<string, number>
    const errors = (readJson(out)?.errors ?? []) as unknown[]
    const passed = (stats.expected ?? 0) + (stats.flaky ?? 0)
    let failed = (stats.unexpected ?? 0) + errors.length
    if (code !== 0 && failed === 0) failed = 1
    results.push({ name: 'playwright', passed, failed, seconds: (Date.now() - start) / 1000 })
  }
}

rmSync(reports, { recursive: true, force: true })

console.log('\nSummary')
for (const r of results) {
  const mark = r.failed ? '✗' : '✓'
  console.log(
    `  ${mark} ${r.name.padEnd(34)} ${String(r.passed).padStart(4)} passed ${String(r.failed).padStart(3)} failed  ${r.seconds.toFixed(1)} s`,
  )
}
const passed = results.reduce((n, r) => n + r.passed, 0)
const failed = results.reduce((n, r) => n + r.failed, 0)
console.log(`${passed} passed, ${failed} failed`)
process.exit(failed ? 1 : 0)
