// Vitest configuration used by mutation testing (`npm run test:mutation`, see stryker.config.mjs):
// the `shared` project of vitest.config.ts alone, so no database or browser setup runs per mutant.
import { fileURLToPath, URL } from 'node:url'
import { defineConfig } from 'vitest/config'

export default defineConfig({
  resolve: {
    alias: { '@shared': fileURLToPath(new URL('../../shared', import.meta.url)) },
  },
  test: {
    name: 'shared',
    root: fileURLToPath(new URL('../..', import.meta.url)),
    include: ['tests/shared/**/*.test.ts'],
    environment: 'node',
    // Stryker times mutants out itself; vitest's 5 s default would count a slow test on a busy
    // machine (the 100,000-record audit) as a kill.
    testTimeout: 60_000,
  },
})
