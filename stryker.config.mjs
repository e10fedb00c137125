// @ts-check
/**
 * Mutation testing of the domain rules (`npm run test:mutation`, not part of `npm test`).
 * Report: reports/mutation/index.html and reports/mutation/mutation.json (git-ignored).
 * Incremental: reruns only test mutants whose code or covering tests changed
 * (reports/mutation/stryker-incremental.json); pass `--force` to redo every mutant.
 * While iterating on one file: `npm run test:mutation -- --mutate shared/domain/progress.ts`.
 *
 * @type {import('@stryker-mutator/api/core').PartialStrykerOptions}
 */
export default {
  testRunner: 'vitest',
  vitest: { configFile: 'tests/shared/mutation.vitest.config.ts' },
  mutate: [
    'shared/domain/audit/**/*.ts',
    'shared/domain/progress.ts',
    'shared/domain/catalogue.ts',
    'shared/domain/age-categories.ts',
  ],
  // The machine is shared: two test processes at most.
  concurrency: 2,
  reporters: ['clear-text', 'progress', 'html', 'json'],
  htmlReporter: { fileName: 'reports/mutation/index.html' },
  jsonReporter: { fileName: 'reports/mutation/mutation.json' },
  incremental: true,
  incrementalFile: 'reports/mutation/stryker-incremental.json',
  tempDirName: '.stryker-tmp',
  cleanTempDir: true,
  thresholds: { high: 95, low: 90, break: null },
}
