import { readdirSync } from 'node:fs'
import { fileURLToPath, pathToFileURL } from 'node:url'

// `npm run bench`: runs every bench/*.bench.ts (or those named on the command line) and prints
// each measurement beside a baseline measured in the same run, as a ratio.
const dir = fileURLToPath(new URL('.', import.meta.url))
const only = process.argv.slice(2)
const files = readdirSync(dir)
  .filter((f) => f.endsWith('.bench.ts'))
  .filter((f) => only.length === 0 || only.some((name) => f.startsWith(name)))
  .sort()

for (const file of files) {
  const mod = (await import(pathToFileURL(`${dir}/${file}`).href)) as {
    default: () => Promise<void>
  }
  await mod.default()
}
