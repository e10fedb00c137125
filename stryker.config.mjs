// @ts-check
/**
 * Mutation testing of the domain rules (`npm run test:mutation`, not part of `npm test`).
 * Report: reports/mutation/index.html and reports/mutation/mutation.json (git-ignored).
 * Incremental: reruns only test mutants whose code or covering tests changed
 * (reports/mutation/stryker-incremental.json); pass `--force` to redo every mutant.
 * While iterating on one file: `npm run test:mutation -- --mutate shared/domain/progress.ts`.
 *
 * Equivalent mutants: no input of the function's domain (JSON data for the hash, valid step
 * indices, directions and catalogue elements) tells them from the code.
 *
 * Disabled in the source with `// Stryker disable next-line <mutator>: <reason>`, because every
 * mutant of that mutator on that line is equivalent:
 * - audit/hashing.ts canonicalJson: `new Array<string>(value.length)` → `new Array()`
 *   (ArrayDeclaration: the size only saves growing the array); the `keys.every(…)` shortcut
 *   (ArrowFunction, LogicalOperator, BlockStatement: the loop after it writes the same text).
 * - audit/hashing.ts flatInKeyOrder: body `{}` and `return true` → `false` (BlockStatement,
 *   BooleanLiteral: an answer of no only skips a shortcut to the same text).
 * - audit/readiness.ts elementMatches: `'string'` → `""` (StringLiteral: no direction word
 *   contains another, so a string's `includes` answers as the one-item array's).
 * - audit/readiness.ts readinessRows: `candidates.get(requirement) ?? []` → `["Stryker was here"]`
 *   (ArrayDeclaration: every requirement was given its candidates just above; never reached).
 * - age-categories.ts addMonths: the month, last-day and day arithmetic (ArithmeticOperator ×3,
 *   MethodExpression): the horizon end is only compared with 1 January of a year, so only its year
 *   counts.
 * - progress.ts replayRecord: resume `record.stepIndex !== null` → `true` (ConditionalExpression:
 *   a planned index, never negative, is never below null); listInEnglish `join('')` (StringLiteral:
 *   one item or none has no separator); checkEvent `prerequisites ?? []` → a stand-in item
 *   (ArrayDeclaration: it has no required step, so is never flagged); lost skill
 *   `current.stepIndex !== null` → `true` (ConditionalExpression: `null > 0` is false).
 *
 * Equivalent but left to show as survivors, since a disable comment works per line and mutator and
 * would also hide killed mutants of the same mutator on that line:
 * - audit/hashing.ts canonicalJson: `value !== null` → `true` (null through the object path writes
 *   "null" too); `if (flatInKeyOrder(object))` → `false` and the `keys.every(…)` condition →
 *   `false` ×4 (shortcuts off, same text).
 * - audit/hashing.ts flatInKeyOrder condition: → `true` ×5, `&&` → `||` ×2 (they only answer no
 *   more often) and `key <= previous` → `<` (an object's keys are unique).
 * - audit/formulas.ts findCatalogueGaps: `e.counterpartId === null` → `false` (a set of ids never
 *   holds null, so `!ids.has(null)` answers the same).
 * - audit/readiness.ts: the seeded "full twist" requirement's `minRotationClass: 'single'` → `""`
 *   (the catalogue derives no twist for a non-salto element, so a full twist implies a salto);
 *   `typeof match.direction === 'string'` → `false` (as its StringLiteral above);
 *   `match.minRotationClass !== undefined` and `match.minTwistBand !== undefined` → `true`
 *   (`indexOf(undefined)` is −1, no element ranks below it); `nearest.needed > 0` → `true` or
 *   `>= 0`, and `if (needed === 0) break` → `false` (the loop stops at the first met candidate, so
 *   `nearest.needed` is never 0 there, and nothing would replace a met one).
 * - audit/run.ts: `e.counterpartId === null ? -1` → `false`, `c === -1 ? 0 : p(c)` → `false`,
 *   `c === -1 ? null` → `false` (a lookup of null or −1 finds nothing, giving the same −1, 0 or
 *   null); `record.stepIndex > before` → `>=` and `pe > best…` → `>=` (the same value is set
 *   again); `cell < cellCount` → `<=` (a write past a typed array's end is ignored);
 *   `if (g.counterpartMissing)` → `true` (only elements whose counterpart is missing are looked up,
 *   and all their gaps have it missing).
 * - catalogue.ts: `.split(/\s+/)` → `/\s/` (the empty words are filtered out); findCounterparts
 *   `key === null ? null` → `false` (a map of text keys has nothing for null);
 *   findPrerequisiteCycle `if (done.has(start)) continue` → `false` (a finished element reaches no
 *   cycle: only the work is repeated, the inner check keeps it linear).
 * - progress.ts: voidedIds `event.correctsEventId !== undefined` → `true` (adds undefined to the
 *   voided ids, which no event has); resume `if (!record.paused) break` → `false` (without a pause
 *   there is no planned step or reason to clear); `plannedStepIndex < stepIndex` → `<=` (moving to
 *   the current step changes nothing); checkEvent `proposed.kind === 'step'` → `true` (other kinds
 *   have no step index: `undefined > n` is false), `current.stepIndex === null ? undefined` →
 *   `false` (`steps[null]` is undefined), `minDays !== undefined` → `true` (`days < undefined` is
 *   false), `proposed.kind === 'pause'` → `true` (only a pause has a reason).
 * - age-categories.ts addMonths: the month and day `padStart(2, '0')` → `""` (only the year of the
 *   horizon end counts, as above).
 *
 * Not equivalent and not excluded: audit/readiness.ts requirementCandidates' tie-break `x - y` →
 * `x + y` survives because the candidates are collected in position order and V8's sort keeps that
 * order under the broken comparator; the ECMAScript specification leaves the result of an
 * inconsistent comparator to the engine, so no test can pin it.
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
