// Rules of the progress record that no other test pins down: the order corrections are settled
// in, and the boundaries of the checks. All rules are the product brief's: common practice (no
// published source); the day counts are worked by hand beside each case.
import { describe, expect, it } from 'vitest'
import { pace } from '../../shared/domain/pace.ts'
import {
  checkEvent,
  compareEvents,
  replayRecord,
  stepOf,
  type CheckContext,
  type ProgressEvent,
  type ProposedEvent,
} from '../../shared/domain/progress.ts'

const step = (
  id: string,
  stepIndex: number,
  occurredOn: string,
  recordedAt: string,
  correctsEventId?: string,
): ProgressEvent => ({
  id,
  kind: 'step',
  stepIndex,
  occurredOn,
  recordedAt,
  coachId: 'coach-1',
  ...(correctsEventId === undefined ? {} : { correctsEventId }),
})

describe('corrections are settled latest entry first, by entry time and then by id', () => {
  it('revives the original when its correction is undone, whatever the ids spell', () => {
    // Ids in the reverse of entry order: an order by id alone would settle c-original's
    // correction last and lose the original step.
    const events = [
      step('c-original', 2, '2025-02-10', '2025-02-10T10:00:00.000Z'),
      step('b-bad-fix', 1, '2025-02-10', '2025-02-11T10:00:00.000Z', 'c-original'),
      step('a-undo', 2, '2025-02-10', '2025-02-12T10:00:00.000Z', 'b-bad-fix'),
    ]
    const record = replayRecord(events)
    expect(record.history.map((e) => e.id)).toEqual(['c-original', 'a-undo'])
    expect(record.stepIndex).toBe(2)
  })

  it('settles corrections entered in the same millisecond by id, the higher id as the later', () => {
    // Same entry time: e-2 (undoing e-1) is settled first, so e-1 voids nothing and e-0 stands.
    const at = '2025-02-10T10:00:00.000Z'
    const events = [
      step('e-0', 3, '2025-02-10', at),
      step('e-1', 1, '2025-02-10', at, 'e-0'),
      step('e-2', 3, '2025-02-10', at, 'e-1'),
    ]
    const record = replayRecord(events)
    expect(record.history.map((e) => e.id)).toEqual(['e-0', 'e-2'])
  })

  it('orders events of one day by entry time before id, and by id only on a tie', () => {
    const a = step('b', 0, '2025-02-10', '2025-02-10T09:00:00.000Z')
    const b = step('a', 1, '2025-02-10', '2025-02-10T10:00:00.000Z')
    const c = step('c', 2, '2025-02-10', '2025-02-10T10:00:00.000Z')
    expect([c, b, a].sort(compareEvents).map((e) => e.id)).toEqual(['b', 'a', 'c'])
    // an earlier day comes first whatever its entry time
    const earlier = step('z', 0, '2025-02-09', '2025-02-11T00:00:00.000Z')
    expect([a, earlier].sort(compareEvents).map((e) => e.id)).toEqual(['z', 'b'])
    expect(compareEvents(a, a)).toBe(0)
  })

  it('leaves out events after the as-of date but keeps those on it', () => {
    const events = [
      step('x', 0, '2025-03-01', '2025-03-01T10:00:00.000Z'),
      step('y', 1, '2025-03-02', '2025-03-02T10:00:00.000Z'),
    ]
    expect(replayRecord(events, { asOf: '2025-03-01' }).stepIndex).toBe(0)
    expect(replayRecord(events, { asOf: '2025-03-02' }).stepIndex).toBe(1)
  })
})

describe('boundaries of the checks before a step is saved', () => {
  const steps: CheckContext['steps'] = [
    { name: 'Floor drills' },
    { name: 'Trampoline', minDays: 14 },
    { name: 'Pit' },
    { name: 'Floor solo' },
  ]
  const stepTo = (stepIndex: number, occurredOn: string, skipReason?: string): ProposedEvent =>
    skipReason === undefined
      ? { kind: 'step', stepIndex, occurredOn }
      : { kind: 'step', stepIndex, occurredOn, skipReason }

  it('passes a step exactly on its minimum day without a warning, and warns a day before', () => {
    // reached 1 March; 1 March + 14 days = 15 March
    const context = { steps, reachedCurrentStepOn: '2025-03-01' }
    expect(checkEvent({ stepIndex: 1 }, stepTo(2, '2025-03-15'), context)).toEqual([])
    expect(checkEvent({ stepIndex: 1 }, stepTo(2, '2025-03-14'), context)).toEqual([
      {
        code: 'min-days',
        severity: 'warning',
        message: 'Step 2 (Trampoline) is passed after 13 days; its minimum is 14 days.',
      },
    ])
  })

  it('has no minimum to check without the date the current step was reached', () => {
    expect(checkEvent({ stepIndex: 1 }, stepTo(2, '2025-03-02'), { steps })).toEqual([])
    expect(
      checkEvent({ stepIndex: 1 }, stepTo(2, '2025-03-02'), { steps, reachedCurrentStepOn: null }),
    ).toEqual([])
  })

  it('treats a skip reason of only spaces as no reason', () => {
    const [result] = checkEvent({ stepIndex: 0 }, stepTo(2, '2025-03-20', '   \t '), { steps })
    expect(result).toEqual({
      code: 'skipped-step',
      severity: 'requires-reason',
      message:
        'Moving from step 1 (Floor drills) to step 3 (Pit) skips step 2 (Trampoline). State a reason for the skip.',
      skippedStepIndices: [1],
    })
  })

  it('trims the reason it quotes', () => {
    const [result] = checkEvent({ stepIndex: 0 }, stepTo(2, '2025-03-20', '  Camp  '), { steps })
    expect(result?.severity).toBe('warning')
    expect(result?.message).toMatch(/Reason given: Camp$/)
  })

  it('checks nothing when the current step is recorded again', () => {
    // Not a move up: no skip, no minimum days, no prerequisite, though all would apply to a move.
    const context: CheckContext = {
      steps,
      reachedCurrentStepOn: '2025-03-01',
      prerequisites: [{ elementName: 'Round-off', requiredStepIndex: 3, athleteStepIndex: null }],
    }
    expect(checkEvent({ stepIndex: 1 }, stepTo(1, '2025-03-02'), context)).toEqual([])
    // the first step from never started is a move up, one step: only the prerequisite applies
    expect(checkEvent({ stepIndex: null }, stepTo(0, '2025-03-02'), context)).toEqual([
      {
        code: 'prerequisite',
        severity: 'warning',
        message: 'Prerequisite not met: Round-off should be at step 4 or higher (now not started).',
      },
    ])
  })

  it('names a step without a name in the progression by its number alone', () => {
    const [result] = checkEvent({ stepIndex: 2 }, stepTo(5, '2025-03-20'), { steps })
    expect(result?.message).toBe(
      'Moving from step 3 (Pit) to step 6 skips step 4 (Floor solo) and step 5. State a reason for the skip.',
    )
  })

  it('counts a step from 1 and out of the progression length', () => {
    expect(stepOf(6, 9)).toBe('step 7 of 9')
    expect(stepOf(6)).toBe('step 7')
    expect(stepOf(0, null)).toBe('step 1')
  })

  it('is met by a prerequisite exactly at its required step', () => {
    const context: CheckContext = {
      steps,
      prerequisites: [{ elementName: 'Round-off', requiredStepIndex: 2, athleteStepIndex: 2 }],
    }
    expect(checkEvent({ stepIndex: 0 }, stepTo(1, '2025-03-02'), context)).toEqual([])
  })

  it('lists three skipped steps with commas and a final "and"', () => {
    const [result] = checkEvent({ stepIndex: 0 }, stepTo(4, '2025-03-20'), { steps })
    expect(result?.message).toBe(
      'Moving from step 1 (Floor drills) to step 5 skips step 2 (Trampoline), step 3 (Pit) and step 4 (Floor solo). State a reason for the skip.',
    )
  })

  it('checks no minimum for a step beyond the progression as it now stands', () => {
    // a record at index 5 of a progression since shortened to 4 steps: no rule for that step
    const context = { steps, reachedCurrentStepOn: '2025-03-01' }
    expect(checkEvent({ stepIndex: 5 }, stepTo(6, '2025-03-02'), context)).toEqual([])
  })

  it('flags a prerequisite never started even when its first step is enough', () => {
    const context: CheckContext = {
      steps,
      prerequisites: [{ elementName: 'Round-off', requiredStepIndex: 0, athleteStepIndex: null }],
    }
    expect(checkEvent({ stepIndex: 0 }, stepTo(1, '2025-03-02'), context)).toEqual([
      {
        code: 'prerequisite',
        severity: 'warning',
        message: 'Prerequisite not met: Round-off should be at step 1 or higher (now not started).',
      },
    ])
  })

  it('runs no step check on a pause', () => {
    // a pause one day into a step of 14 minimum days, with a prerequisite unmet: none applies
    const context: CheckContext = {
      steps,
      reachedCurrentStepOn: '2025-03-01',
      prerequisites: [{ elementName: 'Round-off', requiredStepIndex: 3, athleteStepIndex: null }],
    }
    const pause: ProposedEvent = { kind: 'pause', reason: 'fear', occurredOn: '2025-03-02' }
    expect(checkEvent({ stepIndex: 1 }, pause, context)).toEqual([])
  })
})

describe('replay edges', () => {
  const ev = (id: string, on: string, change: Record<string, unknown>): ProgressEvent =>
    ({
      id,
      occurredOn: on,
      recordedAt: `${on}T10:00:00.000Z`,
      coachId: 'coach-1',
      ...change,
    }) as ProgressEvent

  it('keeps one timeline point per day, the last change of that day', () => {
    const record = replayRecord([
      ev('1', '2025-01-10', { kind: 'step', stepIndex: 0 }),
      ev('2', '2025-02-10', { kind: 'step', stepIndex: 1 }),
      ev('3', '2025-03-10', { kind: 'step', stepIndex: 2 }),
      {
        ...ev('4', '2025-03-10', { kind: 'step', stepIndex: 3 }),
        recordedAt: '2025-03-10T11:00:00.000Z',
      },
    ])
    expect(record.timeline).toEqual([
      ['2025-01-10', 0, 0],
      ['2025-02-10', 1, 1],
      ['2025-03-10', 3, 3],
    ])
  })

  it('never moves the athlete up on resume to a planned step above the current one', () => {
    // planned step index 3 while at index 1: the resume keeps index 1
    const record = replayRecord([
      ev('1', '2025-01-10', { kind: 'step', stepIndex: 1 }),
      ev('2', '2025-02-10', { kind: 'pause', reason: 'injury', plannedStepIndex: 3 }),
      ev('3', '2025-03-10', { kind: 'resume' }),
    ])
    expect(record).toMatchObject({ stepIndex: 1, paused: false, plannedStepIndex: null })
  })

  it('has no pace over a window of no days', () => {
    const events = [ev('1', '2025-01-10', { kind: 'step', stepIndex: 2 })]
    expect(pace(events, '2025-03-01', 0)).toBe(0)
    // 180 days up to 2025-03-01: from never started (−1) to index 2 = 3 steps; 3 / 180 × 30 = 0.5
    expect(pace(events, '2025-03-01')).toBeCloseTo(0.5, 12)
  })
})
