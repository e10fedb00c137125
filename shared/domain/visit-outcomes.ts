import { stepsAsOf } from './pace.ts'
import type { TimelinePoint } from './progress.ts'
import { addDaysIso } from './visits.ts'
import type { RecommendationStatus } from './visits.ts'

// What a visit changed, as the next audit sees it. For each recommendation naming an athlete
// and an element: the step the athlete held when it was made and the step as of the audit.
//
// Rules (documented in the README, Visits):
// - "The day of the visit" for a recommendation is the day it was made, and the step it found
//   is the step at the end of the day before: the timeline keeps one point per day, so a step
//   logged later that same day (the coach acting on it at once) counts as movement.
// - Moved: the step as of the audit is above that step (never started counts as one below the
//   first step). The current step, not the highest: a lost skill that stepped the athlete down
//   is not movement.
// - Accepted: accepted or done as of the audit date.
// - Comparable: the same element for the other athletes of the same squad that no
//   recommendation named on that element, measured from the same day; each athlete × element
//   once, from the earliest such day.

export interface OutcomeRecommendation {
  id: string
  squadId: string
  athleteId: string
  elementId: string
  /** The status as of the audit date. */
  status: RecommendationStatus
  /** The day it was made (ISO date). */
  madeOn: string
  suggestedStepIndex: number | null
}

export interface OutcomeInputs {
  asOf: string
  recommendations: readonly OutcomeRecommendation[]
  /** Each record's timeline, keyed `athleteId:elementId`; a missing one was never started. */
  timelines: ReadonlyMap<string, readonly TimelinePoint[]>
  /** The athletes of each squad of the scope. */
  athletesBySquad: ReadonlyMap<string, readonly string[]>
}

export interface RecommendationOutcome {
  recommendationId: string
  squadId: string
  athleteId: string
  elementId: string
  status: RecommendationStatus
  madeOn: string
  suggestedStepIndex: number | null
  /** The step at the end of the day before it was made (null: not started). */
  stepBefore: number | null
  /** The step as of the audit (null: not started). */
  stepAtAudit: number | null
  moved: boolean
}

export interface OutcomeSummary {
  accepted: number
  acceptedMoved: number
  comparable: number
  comparableMoved: number
}

export interface VisitOutcomes {
  asOf: string
  recommendations: RecommendationOutcome[]
  summary: OutcomeSummary
}

const recordKey = (athleteId: string, elementId: string) => `${athleteId}:${elementId}`
const countsAsAccepted = (status: RecommendationStatus) =>
  status === 'accepted' || status === 'done'

function stepOn(
  timelines: OutcomeInputs['timelines'],
  athleteId: string,
  elementId: string,
  day: string,
): number | null {
  const timeline = timelines.get(recordKey(athleteId, elementId))
  return timeline ? (stepsAsOf(timeline, day)?.[1] ?? null) : null
}

/** Whether the step went up: never started counts as one below the first step. */
const movedUp = (before: number | null, after: number | null) =>
  after !== null && after > (before ?? -1)

/** The outcomes of the recommendations of a scope as of an audit date (rules above). */
export function visitOutcomes(inputs: OutcomeInputs): VisitOutcomes {
  const { asOf, timelines } = inputs
  const rows = [...inputs.recommendations]
    .sort((a, b) => a.madeOn.localeCompare(b.madeOn) || a.id.localeCompare(b.id))
    .map((r): RecommendationOutcome => {
      const stepBefore = stepOn(timelines, r.athleteId, r.elementId, addDaysIso(r.madeOn, -1))
      const stepAtAudit = stepOn(timelines, r.athleteId, r.elementId, asOf)
      return {
        recommendationId: r.id,
        squadId: r.squadId,
        athleteId: r.athleteId,
        elementId: r.elementId,
        status: r.status,
        madeOn: r.madeOn,
        suggestedStepIndex: r.suggestedStepIndex,
        stepBefore,
        stepAtAudit,
        moved: movedUp(stepBefore, stepAtAudit),
      }
    })
  const accepted = rows.filter((r) => countsAsAccepted(r.status))
  const named = new Set(rows.map((r) => recordKey(r.athleteId, r.elementId)))
  // Each comparable athlete × element from the earliest accepted recommendation's day.
  const comparable = new Map<string, { athleteId: string; elementId: string; from: string }>()
  for (const r of accepted) {
    for (const athleteId of inputs.athletesBySquad.get(r.squadId) ?? []) {
      const key = recordKey(athleteId, r.elementId)
      if (named.has(key) || comparable.has(key)) continue
      comparable.set(key, { athleteId, elementId: r.elementId, from: r.madeOn })
    }
  }
  let comparableMoved = 0
  for (const c of comparable.values()) {
    const before = stepOn(timelines, c.athleteId, c.elementId, addDaysIso(c.from, -1))
    if (movedUp(before, stepOn(timelines, c.athleteId, c.elementId, asOf))) comparableMoved++
  }
  return {
    asOf,
    recommendations: rows,
    summary: {
      accepted: accepted.length,
      acceptedMoved: accepted.filter((r) => r.moved).length,
      comparable: comparable.size,
      comparableMoved,
    },
  }
}

/** The outcomes with an erased athlete's id replaced (see shared/domain/erasure.ts). */
export function replaceOutcomeAthleteId(
  outcomes: VisitOutcomes,
  athleteId: string,
  replacement: string,
): VisitOutcomes | null {
  if (!outcomes.recommendations.some((r) => r.athleteId === athleteId)) return null
  return {
    ...outcomes,
    recommendations: outcomes.recommendations.map((r) =>
      r.athleteId === athleteId ? { ...r, athleteId: replacement } : r,
    ),
  }
}
