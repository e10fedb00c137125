/**
 * Whether a clinician's visit window, inclusive at both ends, contains `today` (YYYY-MM-DD).
 * Other roles have no window: null bounds mean always open.
 */
export function windowOpen(today: string, startsOn: string | null, endsOn: string | null): boolean {
  if (startsOn && today < startsOn) return false
  if (endsOn && today > endsOn) return false
  return true
}

/** Today's date in UTC as YYYY-MM-DD: visit windows are compared in calendar days. */
export const todayIso = (now: Date = new Date()) => now.toISOString().slice(0, 10)
