// `npm run db:migrate`. In production (NODE_ENV=production) it runs the compiled command in
// build/ on plain node, as `npm run serve` runs the compiled server; elsewhere the TypeScript
// sources through tsx. Plain JavaScript, so that it chooses before any TypeScript loader runs.
import { existsSync } from 'node:fs'

if (process.env.NODE_ENV === 'production') {
  const compiled = new URL('../../build/server/cli/migrate.js', import.meta.url)
  if (!existsSync(compiled)) {
    console.error('No server build in build/: run `npm run build` first.')
    process.exit(1)
  }
  await import(compiled.href)
} else {
  const { register } = await import('tsx/esm/api')
  register()
  await import('./migrate.ts')
}
