import { gapDeficit } from '@shared/domain/audit/formulas'
import type { SquadLevel } from '@shared/domain/club'
import type { Direction, RotationClass } from '@shared/domain/element'
import { rotationClasses } from '@shared/domain/element'
import type { PauseReason } from '@shared/domain/progress'
import { pauseReasons } from '@shared/domain/progress'
import type { CheckResultView, EventView, RecordDetail, RecordView } from '@shared/schemas/progress'

// How progress is named on screen, in the trade's words, and the small derivations the progress
// screens share (the gap of a backward/forward pair).

/** A forward element this many steps behind its backward mirror is on the coaches' list. */
export const trailThreshold = 2

export const pauseReasonLabels: Record<PauseReason, string> = {
  'lost-skill': 'Lost skill (mental block)',
  injury: 'Injury',
  fear: 'Fear',
  other: 'Other',
}
export const pauseReasonOptions = pauseReasons.map((value) => ({
  label: pauseReasonLabels[value],
  value,
}))

export const squadLevelLabels: Record<SquadLevel, string> = {
  development: 'Development',
  intermediate: 'Intermediate',
  junior: 'Junior',
  senior: 'Senior',
}

export const directionLabels: Record<Direction, string> = {
  backward: 'Backward',
  forward: 'Forward',
  sideward: 'Sideward',
}

export const rotationClassLabels: Record<RotationClass, string> = {
  none: 'No salto',
  single: 'Single salto',
  double: 'Double salto',
  triple: 'Triple salto or more',
}
export const rotationClassOptions = rotationClasses.map((value) => ({
  label: rotationClassLabels[value],
  value,
}))

export const checkLabels: Record<CheckResultView['code'], string> = {
  'skipped-step': 'Skipped steps',
  'min-days': 'Faster than the minimum days',
  prerequisite: 'Prerequisite not met',
  'lost-skill-step-down': 'Lost skill: step down',
}

const plural = (n: number, word: string) => `${n} ${word}${n === 1 ? '' : 's'}`

/** The step reached as a coach reads it on the grid: "3/8" (the third of eight), "–" never started. */
export function stepFraction(stepIndex: number | null, stepCount: number): string {
  return stepIndex === null ? '–' : `${stepIndex + 1}/${stepCount}`
}

/** "Step 3 · Tumble track drills": people count steps from 1, the data from 0. */
export function stepLabel(steps: readonly { name: string }[], index: number | null): string {
  if (index === null) return 'Not started'
  const name = steps[index]?.name
  return name === undefined ? `Step ${index + 1}` : `Step ${index + 1} · ${name}`
}

/**
 * How many steps the forward element trails its backward mirror, in the forward element's own
 * steps (the rule of the audit and the coaches' list); null when the backward one is not started
 * or a progression has no steps.
 */
export function forwardTrail(
  backward: { stepIndex: number | null; stepCount: number },
  forward: { stepIndex: number | null; stepCount: number },
): number | null {
  if (backward.stepIndex === null || backward.stepCount <= 0 || forward.stepCount <= 0) return null
  return gapDeficit({ stepIndex: backward.stepIndex, stepCount: backward.stepCount }, forward)
}

/** One entry of an athlete's history, with what is needed to name its element and steps. */
export interface TimelineItem {
  event: EventView
  elementId: string
  elementName: string
  steps: RecordDetail['steps']
}

/** What an event did, in one line. */
export function eventSummary(event: EventView, steps: readonly { name: string }[]): string {
  if (event.kind === 'step') return `Reached ${stepLabel(steps, event.stepIndex).toLowerCase()}`
  if (event.kind === 'resume') return 'Training resumed'
  const reason = event.pauseReason ? pauseReasonLabels[event.pauseReason].toLowerCase() : 'paused'
  const plan =
    event.plannedStepIndex === null
      ? ''
      : `; rebuild from ${stepLabel(steps, event.plannedStepIndex).toLowerCase()}`
  return `Paused: ${reason}${plan}`
}

/** The current state of a record in one sentence, e.g. for a 409 answer. */
export function recordSummary(
  record: Pick<RecordView, 'stepIndex' | 'paused' | 'pauseReason' | 'lastEventOn'>,
  steps: readonly { name: string }[],
): string {
  const step =
    record.stepIndex === null
      ? 'Not started'
      : `${stepLabel(steps, record.stepIndex)} (${stepFraction(record.stepIndex, steps.length)})`
  const pause = record.paused
    ? `, paused${record.pauseReason ? ` (${pauseReasonLabels[record.pauseReason].toLowerCase()})` : ''}`
    : ''
  const last = record.lastEventOn ? `; last entry on ${record.lastEventOn}` : ''
  return `${step}${pause}${last}.`
}

export interface PairElement {
  elementId: string
  name: string
  /** Names repeat across apparatus (a back tuck on floor and on trampoline). */
  apparatus?: string
  direction: Direction
  counterpartId: string | null
  stepCount: number
}

export interface PairGap {
  backward: PairElement
  backwardStep: number | null
  /** Null when the catalogue has no forward mirror of the backward element. */
  forward: PairElement | null
  forwardStep: number | null
  /** Steps the forward element trails by (negative when ahead); null when not comparable. */
  trail: number | null
  /** Readable without colour: the gap in words. */
  text: string
  /** On the coaches' list: trails by the threshold or more, not started, or missing. */
  lagging: boolean
}

/**
 * Every backward/forward pair in which the athlete has started at least one side, with the gap
 * between the two, in the order of the backward elements.
 */
export function pairGaps(
  records: readonly Pick<RecordView, 'elementId' | 'stepIndex'>[],
  elements: readonly PairElement[],
): PairGap[] {
  const byId = new Map(elements.map((e) => [e.elementId, e]))
  const stepOf = new Map(records.map((r) => [r.elementId, r.stepIndex]))
  const started = (id: string | undefined) => id !== undefined && (stepOf.get(id) ?? null) !== null
  const gaps: PairGap[] = []
  for (const backward of elements) {
    if (backward.direction !== 'backward') continue
    const forward = backward.counterpartId ? (byId.get(backward.counterpartId) ?? null) : null
    if (!started(backward.elementId) && !started(forward?.elementId)) continue
    const backwardStep = stepOf.get(backward.elementId) ?? null
    const forwardStep = forward ? (stepOf.get(forward.elementId) ?? null) : null
    const trail = forward
      ? forwardTrail(
          { stepIndex: backwardStep, stepCount: backward.stepCount },
          { stepIndex: forwardStep, stepCount: forward.stepCount },
        )
      : null
    let text: string
    let lagging = false
    if (!forward) {
      text = 'no forward element in the catalogue'
      lagging = true
    } else if (backwardStep === null) {
      text = 'backward not started'
    } else if (forwardStep === null) {
      text = 'forward not started'
      lagging = true
    } else if (trail !== null && trail > 0) {
      text = `forward trails by ${plural(trail, 'step')}`
      lagging = trail >= trailThreshold
    } else if (trail !== null && trail < 0) {
      text = `forward ahead by ${plural(-trail, 'step')}`
    } else {
      text = 'forward keeps up'
    }
    gaps.push({ backward, backwardStep, forward, forwardStep, trail, text, lagging })
  }
  return gaps
}

/** Today in the coach's own calendar (the gym's day), as YYYY-MM-DD. */
export function localToday(now = new Date()): string {
  const y = now.getFullYear()
  const m = String(now.getMonth() + 1).padStart(2, '0')
  const d = String(now.getDate()).padStart(2, '0')
  return `${y}-${m}-${d}`
}
