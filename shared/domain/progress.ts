// An athlete's record for one element is never stored as a number that gets overwritten: it is
// replayed from an append-only list of events, so every figure can be traced back to a coach and
// a date, and a mistake is fixed by a new event that voids the old one.

import { safetyCaution } from './element.ts'

export const progressEventKinds = ['step', 'pause', 'resume'] as const
export type ProgressEventKind = (typeof progressEventKinds)[number]

export const pauseReasons = ['lost-skill', 'injury', 'fear', 'other'] as const
export type PauseReason = (typeof pauseReasons)[number]

/** What an event changes; step indices are 0-based positions in the element's progression. */
export type ProgressChange =
  | { kind: 'step'; stepIndex: number }
  | {
      kind: 'pause'
      reason: PauseReason
      /** The step the athlete will rebuild from; applied when training resumes. */
      plannedStepIndex?: number
    }
  | { kind: 'resume' }

export interface ProgressEventMeta {
  id: string
  /** ISO date (YYYY-MM-DD) the event happened in the gym. */
  occurredOn: string
  /** ISO timestamp in UTC (`…Z`) it was entered; orders events of the same day. */
  recordedAt: string
  coachId: string
  note?: string
  /** Set on a correction: the id of the earlier, mistaken event this one voids. */
  correctsEventId?: string
  /** Why the athlete moves up more than one step at once. */
  skipReason?: string
}

export type ProgressEvent = ProgressChange & ProgressEventMeta

/** An event before it is saved: what the checks need to see. */
export type ProposedEvent = ProgressChange & { occurredOn: string; skipReason?: string }

export interface ProgressRecord {
  /** The current step; null when the athlete never started the element. */
  stepIndex: number | null
  /** The highest step ever reached, which a step-down after a lost skill does not lower. */
  highestStepIndex: number | null
  /** The date the current step was reached (null when never started). */
  stepReachedOn: string | null
  paused: boolean
  pauseReason: PauseReason | null
  /** The step-down planned by the pause in force, applied on resume. */
  plannedStepIndex: number | null
  lastEventOn: string | null
  /** The effective events in replay order: voided ones and those after `asOf` left out. */
  history: ProgressEvent[]
  /** The record's steps at the end of each day they changed, oldest first (see stepsAsOf in pace.ts). */
  timeline: TimelinePoint[]
}

/**
 * The record's step and highest step at the end of a day on which either changed. A replay as of
 * any date is the replay of a prefix of the history (events are ordered by the day they occurred
 * first), so the last point on or before a date gives the steps as of that date without reading
 * the events again. A tuple rather than an object: a club's records hold hundreds of thousands of
 * them, stored and read as JSON.
 */
export type TimelinePoint = readonly [on: string, stepIndex: number, highestStepIndex: number]

const msPerDay = 86_400_000

function dayNumber(isoDate: string): number {
  const [y, m, d] = isoDate.split('-').map(Number)
  return Date.UTC(y ?? 0, (m ?? 1) - 1, d ?? 1) / msPerDay
}

/** Whole days from `from` to `to` (ISO dates); negative when `to` is earlier. */
export function daysBetween(from: string, to: string): number {
  return Math.round(dayNumber(to) - dayNumber(from))
}

/** The ISO date `days` days after `isoDate` (before it when negative). */
export function addDays(isoDate: string, days: number): string {
  return new Date((dayNumber(isoDate) + days) * msPerDay).toISOString().slice(0, 10)
}

// Plain comparison rather than localeCompare: ISO dates and UTC timestamps sort as strings, and
// the order must not depend on the runtime's locale.
function compareText(a: string, b: string): number {
  return a < b ? -1 : a > b ? 1 : 0
}

/**
 * Replay order: by `occurredOn`, then `recordedAt` (events of the same day in the order they
 * were entered), then `id` so that the order is total even for identical timestamps.
 */
export function compareEvents(a: ProgressEventMeta, b: ProgressEventMeta): number {
  return (
    compareText(a.occurredOn, b.occurredOn) ||
    compareText(a.recordedAt, b.recordedAt) ||
    compareText(a.id, b.id)
  )
}

/**
 * The ids of events voided by a correction. A correction that is itself voided voids nothing,
 * so a wrong correction can be undone by correcting it. A correction is always entered after the
 * event it voids, so walking from the latest entry back settles each correction before its target.
 */
function voidedIds(events: readonly ProgressEvent[]): Set<string> {
  const byEntry = [...events].sort(
    (a, b) => compareText(b.recordedAt, a.recordedAt) || compareText(b.id, a.id),
  )
  const voided = new Set<string>()
  for (const event of byEntry) {
    if (event.correctsEventId !== undefined && !voided.has(event.id)) {
      voided.add(event.correctsEventId)
    }
  }
  return voided
}

/**
 * Rebuilds an athlete's record for one element from its events.
 *
 * Events are replayed in {@link compareEvents} order. Voided events are skipped wherever they
 * fall: a mistaken entry was never true, so a correction also changes replays as of dates before
 * the correction was entered. With `asOf`, events that occurred after that date are ignored.
 *
 * A step event while paused moves the step but keeps the pause (and replaces its planned
 * step-down); a resume applies the planned step-down if it is lower than the current step. A
 * resume without a pause and a pause during a pause only update the history and the reason.
 */
export function replayRecord(
  events: readonly ProgressEvent[],
  options: { asOf?: string } = {},
): ProgressRecord {
  const voided = voidedIds(events)
  const { asOf } = options
  const history = events
    .filter((e) => !voided.has(e.id) && (asOf === undefined || e.occurredOn <= asOf))
    .sort(compareEvents)

  const record: ProgressRecord = {
    stepIndex: null,
    highestStepIndex: null,
    stepReachedOn: null,
    paused: false,
    pauseReason: null,
    plannedStepIndex: null,
    lastEventOn: null,
    history,
    timeline: [],
  }
  const { timeline } = record
  const moveTo = (stepIndex: number, on: string) => {
    if (record.stepIndex === stepIndex) return
    record.stepIndex = stepIndex
    record.stepReachedOn = on
    record.highestStepIndex = Math.max(record.highestStepIndex ?? stepIndex, stepIndex)
    // Several changes on one day leave one point: the steps at the end of that day.
    const point: TimelinePoint = [on, stepIndex, record.highestStepIndex]
    if (timeline.at(-1)?.[0] === on) timeline[timeline.length - 1] = point
    else timeline.push(point)
  }

  for (const event of history) {
    record.lastEventOn = event.occurredOn
    switch (event.kind) {
      case 'step':
        moveTo(event.stepIndex, event.occurredOn)
        record.plannedStepIndex = null
        break
      case 'pause':
        record.paused = true
        record.pauseReason = event.reason
        record.plannedStepIndex = event.plannedStepIndex ?? null
        break
      case 'resume':
        if (!record.paused) break
        if (
          record.plannedStepIndex !== null &&
          // Stryker disable next-line ConditionalExpression: equivalent for step indices, which are never negative (a planned index below null is never true)
          record.stepIndex !== null &&
          record.plannedStepIndex < record.stepIndex
        ) {
          moveTo(record.plannedStepIndex, event.occurredOn)
        }
        record.paused = false
        record.pauseReason = null
        record.plannedStepIndex = null
        break
    }
  }
  return record
}

export type CheckCode = 'skipped-step' | 'min-days' | 'prerequisite' | 'lost-skill-step-down'
export type CheckSeverity = 'warning' | 'requires-reason'

export interface CheckResult {
  code: CheckCode
  severity: CheckSeverity
  message: string
  /** skipped-step: the step indices passed over. */
  skippedStepIndices?: number[]
  /** lost-skill-step-down: the step proposed to rebuild from. */
  proposedStepIndex?: number
}

export interface ProgressionStepRule {
  name: string
  /** The least number of days an athlete should spend at this step before passing it. */
  minDays?: number
}

export interface PrerequisiteStatus {
  elementName: string
  requiredStepIndex: number
  /** The athlete's current step on the prerequisite element; null when never started. */
  athleteStepIndex: number | null
}

export interface CheckContext {
  /** The element's progression, in order. */
  steps: readonly ProgressionStepRule[]
  /** When the athlete reached their current step (see `ProgressRecord.stepReachedOn`). */
  reachedCurrentStepOn?: string | null
  prerequisites?: readonly PrerequisiteStatus[]
  /** How many steps a lost skill proposes to step down; 2 unless the club configured otherwise. */
  lostSkillStepDown?: number
}

/** Common practice (no published source): rebuild a lost skill from two steps back. */
export const defaultLostSkillStepDown = 2

/**
 * A step as people count it, from 1 and out of the progression's length: index 6 of a
 * nine-step progression is "step 7 of 9". Without the length (an older audit) it is "step 7".
 */
export function stepOf(stepIndex: number, stepCount?: number | null): string {
  return stepCount ? `step ${stepIndex + 1} of ${stepCount}` : `step ${stepIndex + 1}`
}

/** People count steps from 1, the data from 0. */
function stepLabel(steps: readonly ProgressionStepRule[], index: number): string {
  const name = steps[index]?.name
  return name === undefined ? `step ${index + 1}` : `step ${index + 1} (${name})`
}

function listInEnglish(items: readonly string[]): string {
  // Stryker disable next-line StringLiteral: equivalent, one item or none is joined without a separator
  if (items.length <= 1) return items.join('')
  return `${items.slice(0, -1).join(', ')} and ${items[items.length - 1]}`
}

function plural(n: number, word: string): string {
  return `${n} ${word}${n === 1 ? '' : 's'}`
}

/**
 * Checks a proposed event against the athlete's current record before it is saved. None of the
 * checks blocks the event: the coach decides, and a 'requires-reason' result must be answered
 * with a `skipReason`.
 *
 * - skipped-step: moving up more than one step (never started counts as just below step 1).
 *   Requires a reason; once a reason is given it stays on as a warning so the skip is visible.
 * - min-days: the current step is passed before its `minDays` have elapsed since
 *   `context.reachedCurrentStepOn`.
 * - prerequisite: moving up while a prerequisite element is below its required step.
 * - lost-skill-step-down: a pause for a lost skill proposes rebuilding from
 *   `lostSkillStepDown` steps lower (never below the first step), with the safety caution.
 *
 * For a correction, pass the record replayed without the event being corrected.
 * These rules come from the product brief: common practice (no published source).
 */
export function checkEvent(
  current: Pick<ProgressRecord, 'stepIndex'>,
  proposed: ProposedEvent,
  context: CheckContext,
): CheckResult[] {
  const results: CheckResult[] = []
  const { steps } = context
  const from = current.stepIndex ?? -1

  if (proposed.kind === 'step' && proposed.stepIndex > from) {
    const to = proposed.stepIndex
    if (to - from > 1) {
      const skipped = Array.from({ length: to - from - 1 }, (_, i) => from + 1 + i)
      const reason = proposed.skipReason?.trim() ?? ''
      const what = `Moving ${current.stepIndex === null ? 'straight' : `from ${stepLabel(steps, from)}`} to ${stepLabel(steps, to)} skips ${listInEnglish(skipped.map((i) => stepLabel(steps, i)))}.`
      results.push({
        code: 'skipped-step',
        severity: reason === '' ? 'requires-reason' : 'warning',
        message:
          reason === ''
            ? `${what} State a reason for the skip.`
            : `${what} Reason given: ${reason}`,
        skippedStepIndices: skipped,
      })
    }

    const minDays = current.stepIndex === null ? undefined : steps[current.stepIndex]?.minDays
    if (minDays !== undefined && context.reachedCurrentStepOn) {
      const days = daysBetween(context.reachedCurrentStepOn, proposed.occurredOn)
      if (days < minDays) {
        results.push({
          code: 'min-days',
          severity: 'warning',
          message: `${capitalise(stepLabel(steps, from))} is passed after ${plural(days, 'day')}; its minimum is ${plural(minDays, 'day')}.`,
        })
      }
    }

    // Stryker disable next-line ArrayDeclaration: equivalent, a stand-in item has no required step, so it is never flagged
    for (const prerequisite of context.prerequisites ?? []) {
      const reached = prerequisite.athleteStepIndex ?? -1
      if (reached < prerequisite.requiredStepIndex) {
        const now =
          prerequisite.athleteStepIndex === null
            ? 'not started'
            : `at step ${prerequisite.athleteStepIndex + 1}`
        results.push({
          code: 'prerequisite',
          severity: 'warning',
          message: `Prerequisite not met: ${prerequisite.elementName} should be at step ${prerequisite.requiredStepIndex + 1} or higher (now ${now}).`,
        })
      }
    }
  }

  if (
    proposed.kind === 'pause' &&
    proposed.reason === 'lost-skill' &&
    // Stryker disable next-line ConditionalExpression: equivalent, null > 0 is false
    current.stepIndex !== null &&
    current.stepIndex > 0
  ) {
    const down = context.lostSkillStepDown ?? defaultLostSkillStepDown
    const target = Math.max(0, current.stepIndex - down)
    results.push({
      code: 'lost-skill-step-down',
      severity: 'warning',
      message: `Lost skill: step down ${plural(current.stepIndex - target, 'step')}, from ${stepLabel(steps, current.stepIndex)} to ${stepLabel(steps, target)}, and rebuild from there. ${safetyCaution}`,
      proposedStepIndex: target,
    })
  }

  return results
}

function capitalise(text: string): string {
  return text.charAt(0).toUpperCase() + text.slice(1)
}
