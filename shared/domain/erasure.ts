// Erasing for good: an athlete (a minor, mostly) or a whole club, after the name is typed.

import type { AuditResult } from './audit/types.ts'

/** What reports and exports show where the name of an athlete erased for good was. */
export const erasedAthleteLabel = 'Erased athlete'

/** An athlete's full name, as it is typed to confirm the erasure: given name, then family name. */
export function athleteFullName(athlete: { givenName: string; familyName: string }): string {
  return `${athlete.givenName} ${athlete.familyName}`
}

/**
 * Whether a typed confirmation names what is to be erased: the same characters, case included,
 * spaces around it aside. A near miss is refused: the person is to look at what they erase.
 */
export function confirmationMatches(typed: string, name: string): boolean {
  return typed.trim() !== '' && typed.trim() === name.trim()
}

/** What every form of a stored audit result has: its athletes, readiness rows and gaps. */
type AuditRows = Pick<AuditResult, 'athletes' | 'readiness'> & { gaps: readonly unknown[] }

/**
 * A stored audit result with one athlete's id replaced, or null when the athlete is not in it.
 * Every figure, row and rank stays as it was; only the id changes, to one that nothing else
 * holds, so that the athlete's rows can no longer be tied to anything that kept the old id
 * (a link, a log line, an export taken earlier). Reads both the stored form, whose gaps point at
 * the athletes by position, and the full form written before it, whose gaps carry the id.
 */
export function replaceAthleteId<T extends AuditRows>(
  result: T,
  athleteId: string,
  replacement: string,
): T | null {
  const named = (row: { athleteId: string }) => row.athleteId === athleteId
  if (!result.athletes.some(named) && !result.readiness.some(named)) return null
  const swap = <R extends { athleteId: string }>(row: R): R =>
    named(row) ? { ...row, athleteId: replacement } : row
  return {
    ...result,
    athletes: result.athletes.map(swap),
    readiness: result.readiness.map(swap),
    ...('format' in result ? {} : { gaps: (result as unknown as AuditResult).gaps.map(swap) }),
  }
}
