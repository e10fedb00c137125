import { windowOpen } from './access.ts'

/** Where a visit stands on a given day: before its first day, during it, after its last. */
export type VisitPhase = 'upcoming' | 'open' | 'past' | 'cancelled'

/**
 * The phase of a visit on `today` (YYYY-MM-DD). Both ends are inclusive: a visit from 3 to 5
 * March is open on the 3rd and on the 5th, past on the 6th. A cancelled visit is never open.
 */
export function visitPhase(
  today: string,
  visit: { firstDay: string; lastDay: string; cancelledAt?: string | null },
): VisitPhase {
  if (visit.cancelledAt) return 'cancelled'
  if (today < visit.firstDay) return 'upcoming'
  if (today > visit.lastDay) return 'past'
  return windowOpen(today, visit.firstDay, visit.lastDay) ? 'open' : 'past'
}

export const recommendationPriorities = ['low', 'normal', 'high'] as const
export type RecommendationPriority = (typeof recommendationPriorities)[number]

export const recommendationStatuses = ['open', 'accepted', 'declined', 'done'] as const
export type RecommendationStatus = (typeof recommendationStatuses)[number]

/** What a coach may do with a recommendation from each status. */
const moves: Record<RecommendationStatus, readonly RecommendationStatus[]> = {
  open: ['accepted', 'declined', 'done'],
  accepted: ['declined', 'done'],
  declined: [],
  done: [],
}

/**
 * Whether a coach may move a recommendation from `from` to `to`: an open one may be accepted,
 * declined or done at once; an accepted one declined or done later; declined and done are final.
 */
export const canMoveTo = (from: RecommendationStatus, to: RecommendationStatus) =>
  moves[from].includes(to)

/** Whether a recommendation still asks something of the coaches (a mark in the grid, a reminder). */
export const stillOpen = (status: RecommendationStatus) =>
  status === 'open' || status === 'accepted'

/** Adds whole days to a calendar date (YYYY-MM-DD), in UTC so no clock change shifts it. */
export function addDaysIso(date: string, days: number): string {
  const at = new Date(`${date}T00:00:00Z`)
  at.setUTCDate(at.getUTCDate() + days)
  return at.toISOString().slice(0, 10)
}

/**
 * The day the reminder goes to the coaches: `daysBefore` days before the due date. Null when
 * that day is not after the day the recommendation was made, since its first mail is then fresh.
 */
export function reminderDay(createdOn: string, dueOn: string, daysBefore: number): string | null {
  const day = addDaysIso(dueOn, -daysBefore)
  return day > createdOn ? day : null
}
