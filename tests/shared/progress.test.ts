import { uniformInt } from 'pure-rand/distribution/uniformInt'
import { xoroshiro128plus } from 'pure-rand/generator/xoroshiro128plus'
import { describe, expect, it } from 'vitest'
import { safetyCaution } from '../../shared/domain/element.ts'
import { athletePace, pace, paceWindow, stepsAsOf, timelinePace } from '../../shared/domain/pace.ts'
import {
  addDays,
  checkEvent,
  daysBetween,
  replayRecord,
  type CheckContext,
  type CheckResult,
  type ProgressChange,
  type ProgressEvent,
  type ProgressEventMeta,
  type ProposedEvent,
} from '../../shared/domain/progress.ts'

let counter = 0
function event(
  change: ProgressChange,
  occurredOn: string,
  meta: Partial<ProgressEventMeta> = {},
): ProgressEvent {
  counter++
  return {
    id: `ev-${counter}`,
    recordedAt: `${occurredOn}T18:00:00.000Z`,
    coachId: 'coach-1',
    occurredOn,
    ...meta,
    ...change,
  }
}
const step = (stepIndex: number, on: string, meta?: Partial<ProgressEventMeta>) =>
  event({ kind: 'step', stepIndex }, on, meta)

describe('replayRecord', () => {
  // Rules from the product brief: common practice (no published source).
  it.each<{
    name: string
    events: ProgressEvent[]
    asOf?: string
    stepIndex: number | null
    highestStepIndex?: number | null
    paused?: boolean
    pauseReason?: string | null
    plannedStepIndex?: number | null
    lastEventOn?: string | null
  }>([
    { name: 'an athlete with no events has never started', events: [], stepIndex: null },
    {
      name: 'steps up one at a time',
      events: [step(0, '2025-01-10'), step(1, '2025-02-10'), step(2, '2025-03-10')],
      stepIndex: 2,
      lastEventOn: '2025-03-10',
    },
    {
      name: 'a step down lowers the current step but not the highest reached',
      events: [step(0, '2025-01-10'), step(3, '2025-02-10'), step(1, '2025-03-10')],
      stepIndex: 1,
      highestStepIndex: 3,
    },
    {
      name: 'events are replayed by date whatever the order they are listed in',
      events: [step(2, '2025-03-10'), step(0, '2025-01-10'), step(1, '2025-02-10')],
      stepIndex: 2,
    },
    {
      name: 'events of the same day are replayed in the order they were recorded',
      events: [
        step(4, '2025-03-10', { recordedAt: '2025-03-10T17:00:00.000Z' }),
        step(3, '2025-03-10', { recordedAt: '2025-03-10T09:00:00.000Z' }),
      ],
      stepIndex: 4,
    },
    {
      name: 'a correction voids the mistaken event and applies its own step',
      events: [
        step(0, '2025-01-10'),
        step(3, '2025-02-10', { id: 'typo' }),
        step(1, '2025-02-10', { correctsEventId: 'typo', recordedAt: '2025-02-12T08:00:00.000Z' }),
      ],
      stepIndex: 1,
      highestStepIndex: 1,
    },
    {
      name: 'a pause for a lost skill keeps the step and holds the planned step-down',
      events: [
        step(3, '2025-01-10'),
        event({ kind: 'pause', reason: 'lost-skill', plannedStepIndex: 1 }, '2025-02-01'),
      ],
      stepIndex: 3,
      paused: true,
      pauseReason: 'lost-skill',
      plannedStepIndex: 1,
    },
    {
      name: 'resuming applies the planned step-down',
      events: [
        step(3, '2025-01-10'),
        event({ kind: 'pause', reason: 'lost-skill', plannedStepIndex: 1 }, '2025-02-01'),
        event({ kind: 'resume' }, '2025-02-20'),
      ],
      stepIndex: 1,
      highestStepIndex: 3,
      paused: false,
      pauseReason: null,
      plannedStepIndex: null,
    },
    {
      name: 'resuming after an injury with no planned step-down keeps the step',
      events: [
        step(3, '2025-01-10'),
        event({ kind: 'pause', reason: 'injury' }, '2025-02-01'),
        event({ kind: 'resume' }, '2025-04-01'),
      ],
      stepIndex: 3,
      paused: false,
    },
    {
      name: 'a step logged during a pause replaces the planned step-down',
      events: [
        step(3, '2025-01-10'),
        event({ kind: 'pause', reason: 'fear', plannedStepIndex: 0 }, '2025-02-01'),
        step(2, '2025-02-05'),
        event({ kind: 'resume' }, '2025-02-20'),
      ],
      stepIndex: 2,
      paused: false,
    },
    {
      name: 'as of a date, later events are ignored',
      events: [
        step(0, '2025-01-10'),
        step(1, '2025-02-10'),
        event({ kind: 'pause', reason: 'injury' }, '2025-03-01'),
        step(2, '2025-03-10'),
      ],
      asOf: '2025-02-28',
      stepIndex: 1,
      paused: false,
      lastEventOn: '2025-02-10',
    },
    {
      name: 'as of a date, an event on that date counts',
      events: [step(0, '2025-01-10'), step(1, '2025-02-10')],
      asOf: '2025-02-10',
      stepIndex: 1,
    },
    {
      name: 'a correction entered after the as-of date still voids the mistake',
      events: [
        step(0, '2025-01-10'),
        step(4, '2025-02-10', { id: 'wrong-athlete' }),
        step(0, '2025-02-10', {
          correctsEventId: 'wrong-athlete',
          recordedAt: '2025-06-01T08:00:00.000Z',
        }),
      ],
      asOf: '2025-03-01',
      stepIndex: 0,
      highestStepIndex: 0,
    },
  ])('$name', (c) => {
    const record = replayRecord(c.events, c.asOf === undefined ? {} : { asOf: c.asOf })
    expect(record.stepIndex).toBe(c.stepIndex)
    if (c.highestStepIndex !== undefined) expect(record.highestStepIndex).toBe(c.highestStepIndex)
    if (c.paused !== undefined) expect(record.paused).toBe(c.paused)
    if (c.pauseReason !== undefined) expect(record.pauseReason).toBe(c.pauseReason)
    if (c.plannedStepIndex !== undefined) expect(record.plannedStepIndex).toBe(c.plannedStepIndex)
    if (c.lastEventOn !== undefined) expect(record.lastEventOn).toBe(c.lastEventOn)
  })

  it('keeps the voided event out of the history and leaves the events untouched', () => {
    const events = [
      step(0, '2025-01-10', { id: 'a' }),
      step(3, '2025-02-10', { id: 'typo' }),
      step(1, '2025-02-10', {
        id: 'fix',
        correctsEventId: 'typo',
        recordedAt: '2025-02-11T08:00:00.000Z',
      }),
    ]
    const copy = structuredClone(events)
    expect(replayRecord(events).history.map((e) => e.id)).toEqual(['a', 'fix'])
    expect(events).toEqual(copy)
  })

  it('revives the original event when its correction is itself corrected', () => {
    const events = [
      step(2, '2025-02-10', { id: 'original', recordedAt: '2025-02-10T10:00:00.000Z' }),
      step(1, '2025-02-10', {
        id: 'bad-fix',
        correctsEventId: 'original',
        recordedAt: '2025-02-11T10:00:00.000Z',
      }),
      event({ kind: 'resume' }, '2025-02-10', {
        id: 'undo',
        correctsEventId: 'bad-fix',
        recordedAt: '2025-02-12T10:00:00.000Z',
      }),
    ]
    const record = replayRecord(events)
    expect(record.history.map((e) => e.id)).toEqual(['original', 'undo'])
    expect(record.stepIndex).toBe(2)
  })

  it('records when the current step was reached', () => {
    const record = replayRecord([
      step(0, '2025-01-10'),
      step(1, '2025-02-10'),
      step(1, '2025-02-20'),
      event({ kind: 'pause', reason: 'other' }, '2025-03-01'),
    ])
    expect(record.stepReachedOn).toBe('2025-02-10')
    expect(record.lastEventOn).toBe('2025-03-01')
  })
})

describe('checkEvent', () => {
  const steps: CheckContext['steps'] = [
    { name: 'Floor drills' },
    { name: 'Trampoline', minDays: 14 },
    { name: 'Pit' },
    { name: 'Spotting rig' },
    { name: 'Floor solo' },
    { name: 'Routine' },
  ]
  const stepTo = (stepIndex: number, occurredOn: string, skipReason?: string): ProposedEvent =>
    skipReason === undefined
      ? { kind: 'step', stepIndex, occurredOn }
      : { kind: 'step', stepIndex, occurredOn, skipReason }

  // All rules from the product brief: common practice (no published source).
  it.each<{
    name: string
    current: number | null
    proposed: ProposedEvent
    context?: Partial<CheckContext>
    expected: CheckResult[]
  }>([
    {
      name: 'one step up after the minimum days passes every check',
      current: 1,
      proposed: stepTo(2, '2025-03-20'),
      context: { reachedCurrentStepOn: '2025-03-01' },
      expected: [],
    },
    {
      name: 'a skipped step without a reason requires one, naming the skipped steps',
      current: 2,
      proposed: stepTo(5, '2025-03-20'),
      expected: [
        {
          code: 'skipped-step',
          severity: 'requires-reason',
          message:
            'Moving from step 3 (Pit) to step 6 (Routine) skips step 4 (Spotting rig) and step 5 (Floor solo). State a reason for the skip.',
          skippedStepIndices: [3, 4],
        },
      ],
    },
    {
      name: 'a skipped step with a reason stays visible as a warning',
      current: 2,
      proposed: stepTo(4, '2025-03-20', 'Already landing it solo at the regional camp'),
      expected: [
        {
          code: 'skipped-step',
          severity: 'warning',
          message:
            'Moving from step 3 (Pit) to step 5 (Floor solo) skips step 4 (Spotting rig). Reason given: Already landing it solo at the regional camp',
          skippedStepIndices: [3],
        },
      ],
    },
    {
      name: 'starting above the first step skips the steps below it',
      current: null,
      proposed: stepTo(2, '2025-03-20'),
      expected: [
        {
          code: 'skipped-step',
          severity: 'requires-reason',
          message:
            'Moving straight to step 3 (Pit) skips step 1 (Floor drills) and step 2 (Trampoline). State a reason for the skip.',
          skippedStepIndices: [0, 1],
        },
      ],
    },
    {
      name: 'passing a step before its minimum days is flagged',
      current: 1,
      proposed: stepTo(2, '2025-03-10'),
      context: { reachedCurrentStepOn: '2025-03-01' },
      expected: [
        {
          code: 'min-days',
          severity: 'warning',
          message: 'Step 2 (Trampoline) is passed after 9 days; its minimum is 14 days.',
        },
      ],
    },
    {
      name: 'a skip that also leaves the current step early gives both results',
      current: 1,
      proposed: stepTo(3, '2025-03-02', 'Coach decision'),
      context: { reachedCurrentStepOn: '2025-03-01' },
      expected: [
        {
          code: 'skipped-step',
          severity: 'warning',
          message:
            'Moving from step 2 (Trampoline) to step 4 (Spotting rig) skips step 3 (Pit). Reason given: Coach decision',
          skippedStepIndices: [2],
        },
        {
          code: 'min-days',
          severity: 'warning',
          message: 'Step 2 (Trampoline) is passed after 1 day; its minimum is 14 days.',
        },
      ],
    },
    {
      name: 'unmet prerequisites are flagged one by one',
      current: 0,
      proposed: stepTo(1, '2025-03-10'),
      context: {
        prerequisites: [
          { elementName: 'Back handspring', requiredStepIndex: 3, athleteStepIndex: 1 },
          { elementName: 'Round-off', requiredStepIndex: 4, athleteStepIndex: null },
          { elementName: 'Handstand', requiredStepIndex: 2, athleteStepIndex: 2 },
        ],
      },
      expected: [
        {
          code: 'prerequisite',
          severity: 'warning',
          message:
            'Prerequisite not met: Back handspring should be at step 4 or higher (now at step 2).',
        },
        {
          code: 'prerequisite',
          severity: 'warning',
          message:
            'Prerequisite not met: Round-off should be at step 5 or higher (now not started).',
        },
      ],
    },
    {
      name: 'a step down is never held back by prerequisites',
      current: 3,
      proposed: stepTo(1, '2025-03-10'),
      context: {
        prerequisites: [{ elementName: 'Round-off', requiredStepIndex: 4, athleteStepIndex: null }],
      },
      expected: [],
    },
    {
      name: 'a pause for a lost skill proposes stepping down two steps, with the caution',
      current: 4,
      proposed: { kind: 'pause', reason: 'lost-skill', occurredOn: '2025-03-10' },
      expected: [
        {
          code: 'lost-skill-step-down',
          severity: 'warning',
          message: `Lost skill: step down 2 steps, from step 5 (Floor solo) to step 3 (Pit), and rebuild from there. ${safetyCaution}`,
          proposedStepIndex: 2,
        },
      ],
    },
    {
      name: 'the step-down is configurable and never goes below the first step',
      current: 1,
      proposed: { kind: 'pause', reason: 'lost-skill', occurredOn: '2025-03-10' },
      context: { lostSkillStepDown: 3 },
      expected: [
        {
          code: 'lost-skill-step-down',
          severity: 'warning',
          message: `Lost skill: step down 1 step, from step 2 (Trampoline) to step 1 (Floor drills), and rebuild from there. ${safetyCaution}`,
          proposedStepIndex: 0,
        },
      ],
    },
    {
      name: 'a lost skill on the first step has nothing to step down to',
      current: 0,
      proposed: { kind: 'pause', reason: 'lost-skill', occurredOn: '2025-03-10' },
      expected: [],
    },
    {
      name: 'a pause for an injury proposes no step-down',
      current: 4,
      proposed: { kind: 'pause', reason: 'injury', occurredOn: '2025-03-10' },
      expected: [],
    },
  ])('$name', ({ current, proposed, context, expected }) => {
    expect(checkEvent({ stepIndex: current }, proposed, { steps, ...context })).toEqual(expected)
  })
})

describe('pace', () => {
  // 2025-06-30 minus 180 days is 2025-01-01 (31 + 28 + 31 + 30 + 31 + 29 = 180), so the window
  // runs from 2 January to 30 June and the step as of 1 January is the starting point.
  const asOf = '2025-06-30'
  const rebuilt = [
    step(0, '2024-11-01'),
    step(1, '2025-01-01'), // on the day before the window: the starting point
    step(2, '2025-02-01'),
    step(3, '2025-03-01'),
    step(4, '2025-04-01'),
    step(5, '2025-04-20'),
    step(3, '2025-05-01'), // lost skill: two steps down
    step(4, '2025-06-01'),
    step(5, '2025-06-20'),
    step(6, '2025-07-05'), // after the as-of date: ignored
  ]

  // Definitions from the product brief: common practice (no published source).
  it.each<[string, ProgressEvent[], number, number]>([
    // From step 1 to step 5: 6 up and 2 down, net 4; 4 / 180 × 30 = 0.666…
    ['nets out a step-down and its rebuild', rebuilt, 180, (4 / 180) * 30],
    // Never started counts as −1: −1 → 2 is 3 steps; 3 / 180 × 30 = 0.5
    [
      'counts starting the element as a step',
      [step(0, '2025-02-01'), step(1, '2025-03-01'), step(2, '2025-05-01')],
      180,
      0.5,
    ],
    ['is 0 with no events', [], 180, 0],
    // From 3 down to 1: −2 / 180 × 30 = −0.333…
    [
      'is negative for an athlete who ended lower than they began',
      [step(3, '2024-10-01'), step(1, '2025-03-01')],
      180,
      (-2 / 180) * 30,
    ],
    // Window from 2 April: as of 1 April step 4; as of 30 June step 5; 1 / 90 × 30 = 0.333…
    ['follows a shorter window', rebuilt, 90, (1 / 90) * 30],
    // The voided jump to step 5 never happened: −1 → 1 is 2 steps; 2 / 180 × 30 = 0.333…
    [
      'ignores a voided event',
      [
        step(0, '2025-02-01'),
        step(5, '2025-03-01', { id: 'pace-typo' }),
        step(1, '2025-03-01', {
          correctsEventId: 'pace-typo',
          recordedAt: '2025-03-02T08:00:00.000Z',
        }),
      ],
      180,
      (2 / 180) * 30,
    ],
  ])('%s', (_name, events, windowDays, expected) => {
    expect(pace(events, asOf, windowDays)).toBeCloseTo(expected, 12)
  })

  it('adds up the pace on each element for an athlete', () => {
    // 4 net steps on one element and 3 on the other: 7 / 180 × 30 = 1.1666…
    const other = [step(0, '2025-02-01'), step(1, '2025-03-01'), step(2, '2025-05-01')]
    expect(athletePace([rebuilt, other], asOf)).toBeCloseTo(7 / 6, 12)
  })

  it('gives the same pace to the last digit whatever order the elements come in', () => {
    // Seven elements, one step each in the window: 7 / 180 × 30 = 7/6. Adding 1/6 seven times
    // in binary floating point gives 1.166666666666667, one unit in the last place above the
    // nearest double to 7/6 (IEEE 754: each addition rounds); the net steps are added as whole
    // numbers and divided once, so the answer is 7/6 as one division gives it, in any order.
    const one = (k: number) => [step(0, `2025-03-0${k + 1}`)]
    const seven = [0, 1, 2, 3, 4, 5, 6].map(one)
    expect(athletePace(seven, asOf)).toBe(7 / 6)
    expect(athletePace([...seven].reverse(), asOf)).toBe(7 / 6)
  })
})

describe('record timeline', () => {
  // The audit reads each record's timeline instead of replaying its events as of the audit's
  // date; these checks hold the two to the same answers. Definitions from the product brief:
  // common practice (no published source).
  it('keeps the steps at the end of each day they changed', () => {
    const record = replayRecord([
      step(0, '2025-01-10'),
      step(2, '2025-02-01', { recordedAt: '2025-02-01T10:00:00.000Z' }),
      // a lower step later the same day: the day ends at step 1, the highest stays 2
      step(1, '2025-02-01', { recordedAt: '2025-02-01T11:00:00.000Z' }),
      event({ kind: 'pause', reason: 'lost-skill', plannedStepIndex: 0 }, '2025-03-01'),
      event({ kind: 'resume' }, '2025-04-01'),
    ])
    // [day, step, highest step]
    expect(record.timeline).toEqual([
      ['2025-01-10', 0, 0],
      ['2025-02-01', 1, 2],
      ['2025-04-01', 0, 2],
    ])
    expect(stepsAsOf(record.timeline, '2025-01-09')).toBeNull()
    expect(stepsAsOf(record.timeline, '2025-03-31')).toEqual(['2025-02-01', 1, 2])
  })

  it('leaves out a voided event even when the correction comes after the date asked for', () => {
    const record = replayRecord([
      step(0, '2025-01-10'),
      step(4, '2025-02-01', { id: 'slip' }),
      step(1, '2025-06-01', { correctsEventId: 'slip', recordedAt: '2025-06-01T08:00:00.000Z' }),
    ])
    expect(stepsAsOf(record.timeline, '2025-03-01')?.[2]).toBe(0)
    expect(replayRecord(record.history, { asOf: '2025-03-01' }).highestStepIndex).toBe(0)
  })

  it('answers as a replay as of each date does, over many generated histories', () => {
    const rng = xoroshiro128plus(2026)
    const int = (min: number, max: number) => uniformInt(rng, min, max)
    const reasons = ['lost-skill', 'injury', 'fear', 'other'] as const
    let compared = 0
    for (let h = 0; h < 300; h++) {
      const events: ProgressEvent[] = []
      const count = int(0, 12)
      for (let i = 0; i < count; i++) {
        // few distinct days, so that several events share a day and the order within it matters
        const on = addDays('2025-01-01', int(0, 40) * 7)
        const meta: Partial<ProgressEventMeta> = {
          id: `h${h}-e${i}`,
          recordedAt: `2025-12-${String(1 + int(0, 2)).padStart(2, '0')}T0${int(0, 9)}:00:00.000Z`,
        }
        if (events.length > 0 && int(0, 5) === 0)
          meta.correctsEventId = events[int(0, events.length - 1)]!.id
        const kind = int(0, 9)
        const change: ProgressChange =
          kind < 6
            ? { kind: 'step', stepIndex: int(0, 7) }
            : kind < 8
              ? {
                  kind: 'pause',
                  reason: reasons[int(0, 3)]!,
                  ...(int(0, 1) ? { plannedStepIndex: int(0, 3) } : {}),
                }
              : { kind: 'resume' }
        events.push(event(change, on, meta))
      }
      const { timeline } = replayRecord(events)
      for (let d = -1; d <= 42; d++) {
        const asOf = addDays('2025-01-01', d * 7 + int(-3, 3))
        const replayed = replayRecord(events, { asOf })
        const point = stepsAsOf(timeline, asOf)
        expect(point?.[1] ?? null).toBe(replayed.stepIndex)
        expect(point?.[2] ?? null).toBe(replayed.highestStepIndex)
        const start = replayRecord(events, { asOf: addDays(asOf, -180) }).stepIndex ?? -1
        expect(timelinePace(timeline, paceWindow(asOf))).toBeCloseTo(
          (((replayed.stepIndex ?? -1) - start) / 180) * 30,
          12,
        )
        compared++
      }
    }
    expect(compared).toBe(300 * 44)
  })
})

describe('date helpers', () => {
  it.each([
    ['2025-01-01', '2025-06-30', 180],
    ['2024-02-28', '2024-03-01', 2],
    ['2025-03-10', '2025-03-01', -9],
  ])('counts the days from %s to %s', (from, to, days) => {
    expect(daysBetween(from, to)).toBe(days)
    expect(addDays(from, days)).toBe(to)
  })
})
