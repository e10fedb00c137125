import { daysBetween } from './progress.ts'

/**
 * True when an athlete is due a look: nothing logged ever, or their latest progress was logged
 * `days` days or more before `today` (ISO dates). A log on `today − days + 1` is still recent.
 */
export function isProgressDue(lastEventOn: string | null, today: string, days: number): boolean {
  return lastEventOn === null || daysBetween(lastEventOn, today) >= days
}

/** The order of a due list: never logged first, then the longest since a log, then by name. */
export function compareDue(
  a: { lastEventOn: string | null; athleteName: string },
  b: { lastEventOn: string | null; athleteName: string },
): number {
  if (a.lastEventOn !== b.lastEventOn) {
    if (a.lastEventOn === null) return -1
    if (b.lastEventOn === null) return 1
    return a.lastEventOn < b.lastEventOn ? -1 : 1
  }
  // Plain comparison, as for dates: the order must not depend on the runtime's locale.
  return a.athleteName < b.athleteName ? -1 : a.athleteName > b.athleteName ? 1 : 0
}
